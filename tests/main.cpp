// The one translation unit that holds doctest's main (it is slow to compile).
#define DOCTEST_CONFIG_IMPLEMENT_WITH_MAIN
#include <doctest/doctest.h>
