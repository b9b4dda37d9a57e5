// expect: conversion from .* to non-scalar type|could not convert|no match|cannot convert
// Unit arithmetic is checked: a time constant cannot be stored as a voltage.
#include <tauforge/units.hpp>

int main() {
    using namespace tauforge::literals;
#ifdef TAUFORGE_CONTROL
    tauforge::duration tau = 4.7_kohm * 100_nF;
#else
    tauforge::voltage tau = 4.7_kohm * 100_nF;
#endif
    return tau.value() > 0 ? 0 : 1;
}
