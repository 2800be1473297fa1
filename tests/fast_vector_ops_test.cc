// The optimised N_Vector kernels give what SUNDIALS' own serial kernels give.
#include <catch2/catch.hpp>

#include <nvector/nvector_serial.h>

#include <memory>

#include "engine/fast_vector_ops.h"

namespace lcc {
namespace {

struct Vectors {
  SUNContext ctx = nullptr;
  N_Vector ref[4] = {};
  N_Vector fast[4] = {};
  Vectors() {
    SUNContext_Create(nullptr, &ctx);
    for (int k = 0; k < 4; ++k) {
      ref[k] = N_VNew_Serial(17, ctx);
      fast[k] = N_VNew_Serial(17, ctx);
    }
    UseFastVectorOps(fast[0]);
    for (int k = 1; k < 4; ++k) {  // the others as IDA makes them: clones
      N_VDestroy(fast[k]);
      fast[k] = N_VClone(fast[0]);
    }
    for (int k = 0; k < 4; ++k)
      for (int i = 0; i < 17; ++i) {
        const double v = std::sin(1.3 * i + k) * (k + 1) + (i == 5 ? 0.0 : 0.1);
        NV_Ith_S(ref[k], i) = v;
        NV_Ith_S(fast[k], i) = v;
      }
  }
  ~Vectors() {
    for (int k = 0; k < 4; ++k) {
      N_VDestroy(ref[k]);
      N_VDestroy(fast[k]);
    }
    SUNContext_Free(&ctx);
  }
  void RequireEqual(int k) const {
    for (int i = 0; i < 17; ++i) REQUIRE(NV_Ith_S(fast[k], i) == Approx(NV_Ith_S(ref[k], i)).epsilon(1e-15));
  }
};

TEST_CASE("FastVectorKernelsMatchTheSerialKernels", "[vector]") {
  Vectors v;
  N_VLinearSum(0.7, v.ref[0], -1.3, v.ref[1], v.ref[2]);
  N_VLinearSum(0.7, v.fast[0], -1.3, v.fast[1], v.fast[2]);
  v.RequireEqual(2);
  N_VScale(2.5, v.ref[1], v.ref[3]);
  N_VScale(2.5, v.fast[1], v.fast[3]);
  v.RequireEqual(3);
  N_VAbs(v.ref[3], v.ref[2]);
  N_VAbs(v.fast[3], v.fast[2]);
  v.RequireEqual(2);
  REQUIRE(N_VWrmsNorm(v.fast[0], v.fast[2]) == Approx(N_VWrmsNorm(v.ref[0], v.ref[2])).epsilon(1e-14));
  REQUIRE(N_VWrmsNormMask(v.fast[0], v.fast[2], v.fast[1]) ==
          Approx(N_VWrmsNormMask(v.ref[0], v.ref[2], v.ref[1])).epsilon(1e-14));
  REQUIRE(N_VMaxNorm(v.fast[1]) == N_VMaxNorm(v.ref[1]));
  REQUIRE(N_VMin(v.fast[1]) == N_VMin(v.ref[1]));
  double c[3] = {0.5, -2.0, 3.0};
  N_Vector xr[3] = {v.ref[0], v.ref[1], v.ref[2]};
  N_Vector xf[3] = {v.fast[0], v.fast[1], v.fast[2]};
  N_VLinearCombination(3, c, xr, v.ref[3]);
  N_VLinearCombination(3, c, xf, v.fast[3]);
  v.RequireEqual(3);
  // In place: z = x[0] is allowed.
  N_VLinearCombination(3, c, xr, v.ref[0]);
  N_VLinearCombination(3, c, xf, v.fast[0]);
  v.RequireEqual(0);
}

}  // namespace
}  // namespace lcc
