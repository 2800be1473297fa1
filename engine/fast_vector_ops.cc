#include "engine/fast_vector_ops.h"

#include <nvector/nvector_serial.h>

#include <cmath>

namespace lcc {
namespace {

inline sunindextype Len(N_Vector v) { return NV_LENGTH_S(v); }
inline realtype* Data(N_Vector v) { return NV_DATA_S(v); }

void LinearSum(realtype a, N_Vector x, realtype b, N_Vector y, N_Vector z) {
  const realtype* xd = Data(x);
  const realtype* yd = Data(y);
  realtype* zd = Data(z);
  for (sunindextype i = 0, n = Len(x); i < n; ++i) zd[i] = a * xd[i] + b * yd[i];
}

void Const(realtype c, N_Vector z) {
  realtype* zd = Data(z);
  for (sunindextype i = 0, n = Len(z); i < n; ++i) zd[i] = c;
}

void Prod(N_Vector x, N_Vector y, N_Vector z) {
  const realtype* xd = Data(x);
  const realtype* yd = Data(y);
  realtype* zd = Data(z);
  for (sunindextype i = 0, n = Len(x); i < n; ++i) zd[i] = xd[i] * yd[i];
}

void Div(N_Vector x, N_Vector y, N_Vector z) {
  const realtype* xd = Data(x);
  const realtype* yd = Data(y);
  realtype* zd = Data(z);
  for (sunindextype i = 0, n = Len(x); i < n; ++i) zd[i] = xd[i] / yd[i];
}

void Scale(realtype c, N_Vector x, N_Vector z) {
  const realtype* xd = Data(x);
  realtype* zd = Data(z);
  for (sunindextype i = 0, n = Len(x); i < n; ++i) zd[i] = c * xd[i];
}

void Abs(N_Vector x, N_Vector z) {
  const realtype* xd = Data(x);
  realtype* zd = Data(z);
  for (sunindextype i = 0, n = Len(x); i < n; ++i) zd[i] = std::abs(xd[i]);
}

void Inv(N_Vector x, N_Vector z) {
  const realtype* xd = Data(x);
  realtype* zd = Data(z);
  for (sunindextype i = 0, n = Len(x); i < n; ++i) zd[i] = 1.0 / xd[i];
}

void AddConst(N_Vector x, realtype b, N_Vector z) {
  const realtype* xd = Data(x);
  realtype* zd = Data(z);
  for (sunindextype i = 0, n = Len(x); i < n; ++i) zd[i] = xd[i] + b;
}

realtype MaxNorm(N_Vector x) {
  const realtype* xd = Data(x);
  realtype m = 0.0;
  for (sunindextype i = 0, n = Len(x); i < n; ++i) m = std::max(m, std::abs(xd[i]));
  return m;
}

realtype WSqrSum(N_Vector x, N_Vector w) {
  const realtype* xd = Data(x);
  const realtype* wd = Data(w);
  realtype s = 0.0;
  for (sunindextype i = 0, n = Len(x); i < n; ++i) {
    const realtype p = xd[i] * wd[i];
    s += p * p;
  }
  return s;
}

realtype WSqrSumMask(N_Vector x, N_Vector w, N_Vector id) {
  const realtype* xd = Data(x);
  const realtype* wd = Data(w);
  const realtype* idd = Data(id);
  realtype s = 0.0;
  for (sunindextype i = 0, n = Len(x); i < n; ++i) {
    if (idd[i] > 0.0) {
      const realtype p = xd[i] * wd[i];
      s += p * p;
    }
  }
  return s;
}

realtype WrmsNorm(N_Vector x, N_Vector w) { return std::sqrt(WSqrSum(x, w) / Len(x)); }

realtype WrmsNormMask(N_Vector x, N_Vector w, N_Vector id) {
  return std::sqrt(WSqrSumMask(x, w, id) / Len(x));
}

realtype Min(N_Vector x) {
  const realtype* xd = Data(x);
  realtype m = xd[0];
  for (sunindextype i = 1, n = Len(x); i < n; ++i) m = std::min(m, xd[i]);
  return m;
}

int LinearCombination(int nv, realtype* c, N_Vector* x, N_Vector z) {
  realtype* zd = Data(z);
  const sunindextype n = Len(z);
  // z may alias x[0] (z = c0·z + Σ ...), so x[0] is applied first.
  const realtype* x0 = Data(x[0]);
  for (sunindextype i = 0; i < n; ++i) zd[i] = c[0] * x0[i];
  for (int k = 1; k < nv; ++k) {
    const realtype* xk = Data(x[k]);
    const realtype ck = c[k];
    for (sunindextype i = 0; i < n; ++i) zd[i] += ck * xk[i];
  }
  return 0;
}

int ScaleAddMulti(int nv, realtype* a, N_Vector x, N_Vector* y, N_Vector* z) {
  const realtype* xd = Data(x);
  const sunindextype n = Len(x);
  for (int k = 0; k < nv; ++k) {
    const realtype* yd = Data(y[k]);
    realtype* zd = Data(z[k]);
    const realtype ak = a[k];
    for (sunindextype i = 0; i < n; ++i) zd[i] = ak * xd[i] + yd[i];
  }
  return 0;
}

}  // namespace

void UseFastVectorOps(N_Vector v) {
  N_Vector_Ops ops = v->ops;
  ops->nvlinearsum = LinearSum;
  ops->nvconst = Const;
  ops->nvprod = Prod;
  ops->nvdiv = Div;
  ops->nvscale = Scale;
  ops->nvabs = Abs;
  ops->nvinv = Inv;
  ops->nvaddconst = AddConst;
  ops->nvmaxnorm = MaxNorm;
  ops->nvmaxnormlocal = MaxNorm;
  ops->nvwrmsnorm = WrmsNorm;
  ops->nvwrmsnormmask = WrmsNormMask;
  ops->nvwsqrsumlocal = WSqrSum;
  ops->nvwsqrsummasklocal = WSqrSumMask;
  ops->nvmin = Min;
  ops->nvminlocal = Min;
  ops->nvlinearcombination = LinearCombination;
  ops->nvscaleaddmulti = ScaleAddMulti;
}

}  // namespace lcc
