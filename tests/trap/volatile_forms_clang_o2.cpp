// The volatile register forms compiled by Clang at -O2, when Clang is installed: unlike GCC, it
// folds volatile read-modify-write code into instructions on memory (or, and, add on [address]).
#define TB_FORMS_GETTER forms_clang_o2
#define TB_FORMS_LEVEL "clang_O2"
#include "volatile_forms.inc"
