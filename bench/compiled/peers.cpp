// Compiled peers for bench/compiled-peers.ts: Boost.Odeint (Fehlberg 7(8) and Dormand-Prince 5
// controlled, Bulirsch-Stoer, Rosenbrock 4) and SUNDIALS CVODE (BDF, dense or band direct
// solver) on the same problems as stepgauge's catalogue (kepler-eccentric, robertson,
// brusselator-1d, equations as in problems/*.ts). One solve per call of `solve`; the program
// prints one JSON line: the final state, the right-hand-side evaluations of one solve, and the
// median wall and CPU time of repeated solves (object creation included) within a budget.
//
// Usage: peers <problem> <method> <rtol> <atol> <budget-ms>
#include <algorithm>
#include <array>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <ctime>
#include <exception>
#include <string>
#include <vector>

#include <boost/numeric/odeint.hpp>

#ifdef WITH_CVODE
#include <cvode/cvode.h>
#include <nvector/nvector_serial.h>
#include <sunlinsol/sunlinsol_band.h>
#include <sunlinsol/sunlinsol_dense.h>
#include <sunmatrix/sunmatrix_band.h>
#include <sunmatrix/sunmatrix_dense.h>
#endif

namespace odeint = boost::numeric::odeint;
using Vec = boost::numeric::ublas::vector<double>;
using Mat = boost::numeric::ublas::matrix<double>;

static long g_nfev = 0;

// ---- problems ------------------------------------------------------------------------------

// kepler-eccentric: x'' = -x / |x|^3, e = 0.6, t in [0, 20 pi].
struct Kepler {
  static constexpr double E = 0.6;
  template <class S> void operator()(const S &y, S &dy, double) const {
    ++g_nfev;
    const double r2 = y[0] * y[0] + y[1] * y[1];
    const double r3 = r2 * std::sqrt(r2);
    dy[0] = y[2];
    dy[1] = y[3];
    dy[2] = -y[0] / r3;
    dy[3] = -y[1] / r3;
  }
  static std::vector<double> y0() { return {1 - E, 0, 0, std::sqrt((1 + E) / (1 - E))}; }
  static double tEnd() { return 20 * M_PI; }
};

// robertson: t in [0, 1e11].
struct Robertson {
  void operator()(const Vec &y, Vec &dy, double) const {
    ++g_nfev;
    const double a = 0.04 * y[0], b = 1e4 * y[1] * y[2], c = 3e7 * y[1] * y[1];
    dy[0] = -a + b;
    dy[1] = a - b - c;
    dy[2] = c;
  }
  static void jac(const double *y, double *J /* row-major 3x3 */) {
    J[0] = -0.04; J[1] = 1e4 * y[2]; J[2] = 1e4 * y[1];
    J[3] = 0.04; J[4] = -1e4 * y[2] - 6e7 * y[1]; J[5] = -1e4 * y[1];
    J[6] = 0; J[7] = 6e7 * y[1]; J[8] = 0;
  }
  static std::vector<double> y0() { return {1, 0, 0}; }
  static double tEnd() { return 1e11; }
};
struct RobertsonJac {
  void operator()(const Vec &y, Mat &J, double, Vec &dfdt) const {
    double j[9];
    Robertson::jac(&y[0], j);
    for (int r = 0; r < 3; ++r)
      for (int c = 0; c < 3; ++c) J(r, c) = j[3 * r + c];
    dfdt[0] = dfdt[1] = dfdt[2] = 0;
  }
};

// brusselator-1d: N = 500, interleaved (u_1, v_1, ...), alpha = 1/50, t in [0, 10].
struct Brusselator {
  static constexpr int N = 500;
  static void rhs(const double *y, double *dy) {
    ++g_nfev;
    const double c = (1.0 / 50) * (N + 1) * (N + 1);
    for (int i = 0; i < N; ++i) {
      const double u = y[2 * i], v = y[2 * i + 1];
      const double uL = i > 0 ? y[2 * i - 2] : 1, uR = i < N - 1 ? y[2 * i + 2] : 1;
      const double vL = i > 0 ? y[2 * i - 1] : 3, vR = i < N - 1 ? y[2 * i + 3] : 3;
      const double uuv = u * u * v;
      dy[2 * i] = 1 + uuv - 4 * u + c * (uL - 2 * u + uR);
      dy[2 * i + 1] = 3 * u - uuv + c * (vL - 2 * v + vR);
    }
  }
  static std::vector<double> y0() {
    std::vector<double> y;
    for (int i = 1; i <= N; ++i) {
      y.push_back(1 + std::sin(2 * M_PI * i / (N + 1)));
      y.push_back(3);
    }
    return y;
  }
  static double tEnd() { return 10; }
};

// ---- solvers -------------------------------------------------------------------------------

using Solve = std::vector<double> (*)(double rtol, double atol);

template <class Stepper> std::vector<double> keplerWith(Stepper stepper) {
  std::array<double, 4> y;
  auto v = Kepler::y0();
  std::copy(v.begin(), v.end(), y.begin());
  odeint::integrate_adaptive(stepper, Kepler(), y, 0.0, Kepler::tEnd(), 1e-4);
  return std::vector<double>(y.begin(), y.end());
}

using State4 = std::array<double, 4>;
static std::vector<double> keplerRkf78(double rtol, double atol) {
  return keplerWith(odeint::make_controlled(atol, rtol, odeint::runge_kutta_fehlberg78<State4>()));
}
static std::vector<double> keplerDopri5(double rtol, double atol) {
  return keplerWith(odeint::make_controlled(atol, rtol, odeint::runge_kutta_dopri5<State4>()));
}
static std::vector<double> keplerBs(double rtol, double atol) { return keplerWith(odeint::bulirsch_stoer<State4>(atol, rtol)); }

static std::vector<double> robertsonRosenbrock4(double rtol, double atol) {
  Vec y(3);
  auto v = Robertson::y0();
  for (int i = 0; i < 3; ++i) y[i] = v[i];
  odeint::integrate_adaptive(odeint::make_controlled(atol, rtol, odeint::rosenbrock4<double>()), std::make_pair(Robertson(), RobertsonJac()), y, 0.0,
                             Robertson::tEnd(), 1e-6);
  return {y[0], y[1], y[2]};
}

#ifdef WITH_CVODE
static int robRhs(sunrealtype, N_Vector y, N_Vector dy, void *) {
  Vec a(3), b(3);
  for (int i = 0; i < 3; ++i) a[i] = NV_Ith_S(y, i);
  Robertson()(a, b, 0);
  for (int i = 0; i < 3; ++i) NV_Ith_S(dy, i) = b[i];
  return 0;
}
static int robJac(sunrealtype, N_Vector y, N_Vector, SUNMatrix J, void *, N_Vector, N_Vector, N_Vector) {
  double j[9];
  Robertson::jac(N_VGetArrayPointer(y), j);
  for (int r = 0; r < 3; ++r)
    for (int c = 0; c < 3; ++c) SM_ELEMENT_D(J, r, c) = j[3 * r + c];
  return 0;
}
static int brussRhs(sunrealtype, N_Vector y, N_Vector dy, void *) {
  Brusselator::rhs(N_VGetArrayPointer(y), N_VGetArrayPointer(dy));
  return 0;
}

// CVODE BDF with its default settings, a direct solver (dense, or band 2/2 for the Brusselator;
// the Brusselator's Jacobian by CVODE's own difference quotients, Robertson's analytic).
static std::vector<double> cvode(bool robertson, bool band, double rtol, double atol) {
  SUNContext ctx;
  SUNContext_Create(nullptr, &ctx);
  const std::vector<double> v = robertson ? Robertson::y0() : Brusselator::y0();
  const sunindextype n = v.size();
  N_Vector y = N_VNew_Serial(n, ctx);
  for (sunindextype i = 0; i < n; ++i) NV_Ith_S(y, i) = v[i];
  void *mem = CVodeCreate(CV_BDF, ctx);
  CVodeInit(mem, robertson ? robRhs : brussRhs, 0.0, y);
  CVodeSStolerances(mem, rtol, atol);
  CVodeSetMaxNumSteps(mem, 1000000);
  SUNMatrix A = band ? SUNBandMatrix(n, 2, 2, ctx) : SUNDenseMatrix(n, n, ctx);
  SUNLinearSolver LS = band ? SUNLinSol_Band(y, A, ctx) : SUNLinSol_Dense(y, A, ctx);
  CVodeSetLinearSolver(mem, LS, A);
  if (robertson) CVodeSetJacFn(mem, robJac);
  double t = 0;
  const double tEnd = robertson ? Robertson::tEnd() : Brusselator::tEnd();
  const int flag = CVode(mem, tEnd, y, &t, CV_NORMAL);
  std::vector<double> out(n);
  for (sunindextype i = 0; i < n; ++i) out[i] = flag < 0 ? NAN : NV_Ith_S(y, i);
  CVodeFree(&mem);
  SUNLinSolFree(LS);
  SUNMatDestroy(A);
  N_VDestroy(y);
  SUNContext_Free(&ctx);
  return out;
}
static std::vector<double> robertsonCvodeDense(double r, double a) { return cvode(true, false, r, a); }
static std::vector<double> brusselatorCvodeBand(double r, double a) { return cvode(false, true, r, a); }
static std::vector<double> brusselatorCvodeDense(double r, double a) { return cvode(false, false, r, a); }
#endif

static Solve pick(const std::string &problem, const std::string &method) {
  if (problem == "kepler-eccentric") {
    if (method == "boost-rkf78") return keplerRkf78;
    if (method == "boost-dopri5") return keplerDopri5;
    if (method == "boost-bulirsch-stoer") return keplerBs;
  }
  if (problem == "robertson") {
    if (method == "boost-rosenbrock4") return robertsonRosenbrock4;
#ifdef WITH_CVODE
    if (method == "cvode-dense") return robertsonCvodeDense;
#endif
  }
#ifdef WITH_CVODE
  if (problem == "brusselator-1d") {
    if (method == "cvode-band") return brusselatorCvodeBand;
    if (method == "cvode-dense") return brusselatorCvodeDense;
  }
#endif
  return nullptr;
}

int main(int argc, char **argv) {
  if (argc != 6) {
    std::fprintf(stderr, "usage: peers <problem> <method> <rtol> <atol> <budget-ms>\n");
    return 2;
  }
  Solve solve = pick(argv[1], argv[2]);
  if (!solve) {
    std::fprintf(stderr, "peers: no method %s for problem %s in this build\n", argv[2], argv[1]);
    return 2;
  }
  const double rtol = std::atof(argv[3]), atol = std::atof(argv[4]), budgetMs = std::atof(argv[5]);
  g_nfev = 0;
  std::vector<double> y;
  try {
    y = solve(rtol, atol);
  } catch (const std::exception &e) {
    std::fprintf(stderr, "peers: %s %s at rtol %g failed: %s\n", argv[1], argv[2], rtol, e.what());
    return 1;
  }
  const long nfev = g_nfev;
  // Each solve is timed by the wall clock and by this thread's CPU clock. On a loaded machine a
  // solve longer than the scheduler's slice waits for a core inside its wall time (CVODE on
  // robertson: 2.6-2.8 ms of CPU measured as 5-19 ms of wall time at load 6-7), which is not the
  // solve's cost; the CPU median is (bench/README.md, "Reading the targets").
  std::vector<double> ms, cpu;
  using clock = std::chrono::steady_clock;
  const auto start = clock::now();
  // A few warm-up solves, then samples until the budget is spent (at least 5).
  for (int k = 0; k < 3; ++k) solve(rtol, atol);
  while (ms.size() < 5 || std::chrono::duration<double, std::milli>(clock::now() - start).count() < budgetMs) {
    timespec c0, c1;
    const auto t0 = clock::now();
    clock_gettime(CLOCK_THREAD_CPUTIME_ID, &c0);
    solve(rtol, atol);
    clock_gettime(CLOCK_THREAD_CPUTIME_ID, &c1);
    ms.push_back(std::chrono::duration<double, std::milli>(clock::now() - t0).count());
    cpu.push_back((c1.tv_sec - c0.tv_sec) * 1e3 + (c1.tv_nsec - c0.tv_nsec) * 1e-6);
    if (ms.size() >= 100000) break;
  }
  const auto median = [](std::vector<double> &v) {
    std::sort(v.begin(), v.end());
    return v.size() % 2 ? v[v.size() / 2] : (v[v.size() / 2 - 1] + v[v.size() / 2]) / 2;
  };
  const double wall = median(ms), cpuMedian = median(cpu);
  std::printf("{\"nfev\":%ld,\"medianMs\":%.6g,\"cpuMedianMs\":%.6g,\"samples\":%zu,\"y\":[", nfev, wall, cpuMedian, ms.size());
  for (size_t i = 0; i < y.size(); ++i) std::printf("%s%.17g", i ? "," : "", y[i]);
  std::printf("]}\n");
  return 0;
}
