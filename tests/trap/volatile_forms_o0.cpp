// The volatile register forms compiled at -O0 (see tests/trap/CMakeLists.txt).
#define TB_FORMS_GETTER forms_o0
#define TB_FORMS_LEVEL "O0"
#include "volatile_forms.inc"
