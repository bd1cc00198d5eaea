/* SUNDIALS CVODE as a peer of the dynamics benchmark (tests/bench/cvode-peer.ts builds and runs
 * it): BDF with Newton iteration, dense LU and the analytic Jacobian, on the very rate and change
 * tables our kernels use. Reads the problems from stdin as whitespace-separated numbers:
 *   count, then per problem:
 *   n, rates, per rate: coefficient, factors, factors × (variable power),
 *   changes, changes × (variable rate change), n initial values, until, rtol, atol, runs
 * and writes one line per problem: ms (best of the runs), steps, Jacobians, the final state. */
#include <cvode/cvode.h>
#include <math.h>
#include <nvector/nvector_serial.h>
#include <stdio.h>
#include <stdlib.h>
#include <sunlinsol/sunlinsol_dense.h>
#include <sunmatrix/sunmatrix_dense.h>
#include <time.h>

typedef struct {
  int n, rates, changes;
  double *coefficient;
  int *factor_start, *factor_variable;
  double *factor_power;
  int *change_variable, *change_rate;
  double *change_amount, *rate;
} Problem;

static double power(double y, double p) { return p == 1 ? y : p == 2 ? y * y : pow(y, p); }

static int rhs(sunrealtype t, N_Vector y, N_Vector dy, void *data) {
  Problem *p = data;
  const double *x = N_VGetArrayPointer(y);
  double *out = N_VGetArrayPointer(dy);
  (void)t;
  for (int j = 0; j < p->rates; j++) {
    double r = p->coefficient[j];
    for (int f = p->factor_start[j]; f < p->factor_start[j + 1]; f++) r *= power(x[p->factor_variable[f]], p->factor_power[f]);
    p->rate[j] = r;
  }
  for (int i = 0; i < p->n; i++) out[i] = 0;
  for (int e = 0; e < p->changes; e++) out[p->change_variable[e]] += p->change_amount[e] * p->rate[p->change_rate[e]];
  return 0;
}

/* J[i][a] = Σ over changes (i, j, c) and factors a of rate j: c·∂r_j/∂y_a. */
static int jacobian(sunrealtype t, N_Vector y, N_Vector fy, SUNMatrix J, void *data, N_Vector t1, N_Vector t2, N_Vector t3) {
  Problem *p = data;
  const double *x = N_VGetArrayPointer(y);
  (void)t, (void)fy, (void)t1, (void)t2, (void)t3;
  SUNMatZero(J);
  for (int e = 0; e < p->changes; e++) {
    int j = p->change_rate[e], i = p->change_variable[e];
    for (int f = p->factor_start[j]; f < p->factor_start[j + 1]; f++) {
      double power_f = p->factor_power[f];
      double partial = p->coefficient[j] * (power_f == 1 ? 1 : power_f * power(x[p->factor_variable[f]], power_f - 1));
      for (int g = p->factor_start[j]; g < p->factor_start[j + 1]; g++)
        if (g != f) partial *= power(x[p->factor_variable[g]], p->factor_power[g]);
      SM_ELEMENT_D(J, i, p->factor_variable[f]) += p->change_amount[e] * partial;
    }
  }
  return 0;
}

static double now_ms(void) {
  struct timespec ts;
  clock_gettime(CLOCK_MONOTONIC, &ts);
  return ts.tv_sec * 1e3 + ts.tv_nsec / 1e6;
}

static int read_int(void) {
  int v;
  if (scanf("%d", &v) != 1) exit(3);
  return v;
}

static double read_double(void) {
  double v;
  if (scanf("%lf", &v) != 1) exit(3);
  return v;
}

int main(void) {
  SUNContext context;
  if (SUNContext_Create(NULL, &context)) return 1;
  int count = read_int();
  for (int problem = 0; problem < count; problem++) {
    Problem p;
    p.n = read_int();
    p.rates = read_int();
    p.coefficient = malloc(sizeof(double) * p.rates);
    p.rate = malloc(sizeof(double) * p.rates);
    p.factor_start = malloc(sizeof(int) * (p.rates + 1));
    int capacity = 4 * p.rates + 4;
    p.factor_variable = malloc(sizeof(int) * capacity);
    p.factor_power = malloc(sizeof(double) * capacity);
    p.factor_start[0] = 0;
    for (int j = 0; j < p.rates; j++) {
      p.coefficient[j] = read_double();
      int factors = read_int();
      p.factor_start[j + 1] = p.factor_start[j] + factors;
      if (p.factor_start[j + 1] > capacity) {
        capacity = 2 * p.factor_start[j + 1];
        p.factor_variable = realloc(p.factor_variable, sizeof(int) * capacity);
        p.factor_power = realloc(p.factor_power, sizeof(double) * capacity);
      }
      for (int f = p.factor_start[j]; f < p.factor_start[j + 1]; f++) {
        p.factor_variable[f] = read_int();
        p.factor_power[f] = read_double();
      }
    }
    p.changes = read_int();
    p.change_variable = malloc(sizeof(int) * p.changes);
    p.change_rate = malloc(sizeof(int) * p.changes);
    p.change_amount = malloc(sizeof(double) * p.changes);
    for (int e = 0; e < p.changes; e++) {
      p.change_variable[e] = read_int();
      p.change_rate[e] = read_int();
      p.change_amount[e] = read_double();
    }
    double *initial = malloc(sizeof(double) * p.n);
    for (int i = 0; i < p.n; i++) initial[i] = read_double();
    double until = read_double(), rtol = read_double(), atol = read_double();
    int runs = read_int();

    double best = INFINITY;
    long steps = 0, jacobians = 0;
    N_Vector y = N_VNew_Serial(p.n, context);
    for (int run = 0; run < runs; run++) {
      double started = now_ms();
      for (int i = 0; i < p.n; i++) NV_Ith_S(y, i) = initial[i];
      void *memory = CVodeCreate(CV_BDF, context);
      SUNMatrix A = SUNDenseMatrix(p.n, p.n, context);
      SUNLinearSolver solver = SUNLinSol_Dense(y, A, context);
      CVodeInit(memory, rhs, 0.0, y);
      CVodeSStolerances(memory, rtol, atol);
      CVodeSetUserData(memory, &p);
      CVodeSetLinearSolver(memory, solver, A);
      CVodeSetJacFn(memory, jacobian);
      CVodeSetMaxNumSteps(memory, 1000000);
      sunrealtype t;
      int flag = CVode(memory, until, y, &t, CV_NORMAL);
      double ms = now_ms() - started;
      if (flag < 0) {
        fprintf(stderr, "CVODE failed with flag %d on problem %d\n", flag, problem);
        return 2;
      }
      if (ms < best) best = ms;
      CVodeGetNumSteps(memory, &steps);
      CVodeGetNumJacEvals(memory, &jacobians);
      CVodeFree(&memory);
      SUNLinSolFree(solver);
      SUNMatDestroy(A);
    }
    printf("%.6f %ld %ld", best, steps, jacobians);
    for (int i = 0; i < p.n; i++) printf(" %.17g", NV_Ith_S(y, i));
    printf("\n");
    N_VDestroy(y);
    free(initial), free(p.coefficient), free(p.rate), free(p.factor_start), free(p.factor_variable), free(p.factor_power);
    free(p.change_variable), free(p.change_rate), free(p.change_amount);
  }
  SUNContext_Free(&context);
  return 0;
}
