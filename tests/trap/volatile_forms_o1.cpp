// The volatile register forms compiled at -O1 (see tests/trap/CMakeLists.txt).
#define TB_FORMS_GETTER forms_o1
#define TB_FORMS_LEVEL "O1"
#include "volatile_forms.inc"
