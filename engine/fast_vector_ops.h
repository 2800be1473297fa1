// Optimised kernels for the serial N_Vector operations IDA uses most.
//
// Why: Debian's SUNDIALS 6.4 library is built without optimisation (its
// N_VLinearSum_Serial keeps every operand on the stack), and on circuits of a
// few dozen unknowns the vector operations were 40 % of all instructions
// (measured with callgrind on bench/six_pulse_bench). These kernels do the
// same arithmetic, element by element in the same order, compiled with the
// project's flags. UseFastVectorOps() swaps them into a serial vector's
// operation table; vectors IDA clones from it inherit the table.
#pragma once

#include <sundials/sundials_nvector.h>

namespace lcc {

// `v` must be an NVECTOR_SERIAL vector.
void UseFastVectorOps(N_Vector v);

}  // namespace lcc
