// The volatile register forms compiled at -O2 (see tests/trap/CMakeLists.txt).
#define TB_FORMS_GETTER forms_o2
#define TB_FORMS_LEVEL "O2"
#include "volatile_forms.inc"
