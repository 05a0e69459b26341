/*
 * A user's own orbit propagator in the style of flight software: a fixed-step classic Runge-Kutta
 * (W. Kutta, Z. Math. Phys. 46 (1901) 435-453), static storage only, the scenario built in (a
 * circular orbit 400 km above a spherical Earth, one day, point-mass gravity, km and s). It takes
 * its step count from the command line, ignores standard input, and prints CSV (t,x,y,vx,vy), one
 * row per step: the simplest way to answer the stepgauge-program protocol.
 *
 *   gcc -O2 -o build/leo-rk4 leo_rk4.c -lm
 *   ./build/leo-rk4 --steps 8640
 *
 * Built with -DSINGLE_PRECISION_GRAVITY, the acceleration is computed in float: a deliberately
 * degraded build, for showing that `stepgauge check` catches it.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define N_STATE 4
#define MU_EARTH 398600.4418 /* km^3/s^2, WGS 84 */
#define R_ORBIT 6778.137     /* km */
#define T_END 86400.0        /* s */
#define MAX_STEPS 10000000L

static double k1[N_STATE], k2[N_STATE], k3[N_STATE], k4[N_STATE], y_stage[N_STATE], y[N_STATE];

static void derivative(const double *s, double *ds)
{
#ifdef SINGLE_PRECISION_GRAVITY
    float r2 = (float)(s[0] * s[0] + s[1] * s[1]);
    float k = -(float)MU_EARTH / (r2 * sqrtf(r2));
    ds[2] = (double)(k * (float)s[0]);
    ds[3] = (double)(k * (float)s[1]);
#else
    double r2 = s[0] * s[0] + s[1] * s[1];
    double k = -MU_EARTH / (r2 * sqrt(r2));
    ds[2] = k * s[0];
    ds[3] = k * s[1];
#endif
    ds[0] = s[2];
    ds[1] = s[3];
}

static void stage(const double *base, const double *slope, double h, double *out)
{
    int i;
    for (i = 0; i < N_STATE; i++) out[i] = base[i] + h * slope[i];
}

static void print_row(double t)
{
    printf("%.17g,%.17g,%.17g,%.17g,%.17g\n", t, y[0], y[1], y[2], y[3]);
}

int main(int argc, char **argv)
{
    long steps = 0, n;
    int i;
    double h, t;
    for (i = 1; i + 1 < argc; i++) {
        if (strcmp(argv[i], "--steps") == 0) steps = strtol(argv[i + 1], NULL, 10);
    }
    if (steps < 1 || steps > MAX_STEPS) {
        fprintf(stderr, "leo-rk4: --steps must be between 1 and %ld\n", MAX_STEPS);
        return 2;
    }
    h = T_END / (double)steps;
    y[0] = R_ORBIT;
    y[1] = 0.0;
    y[2] = 0.0;
    y[3] = R_ORBIT * sqrt(MU_EARTH / (R_ORBIT * R_ORBIT * R_ORBIT));
    printf("t,x,y,vx,vy\n");
    print_row(0.0);
    for (n = 1; n <= steps; n++) {
        derivative(y, k1);
        stage(y, k1, 0.5 * h, y_stage);
        derivative(y_stage, k2);
        stage(y, k2, 0.5 * h, y_stage);
        derivative(y_stage, k3);
        stage(y, k3, h, y_stage);
        derivative(y_stage, k4);
        for (i = 0; i < N_STATE; i++) y[i] += h / 6.0 * (k1[i] + 2.0 * k2[i] + 2.0 * k3[i] + k4[i]);
        /* t from the step index, so the last row is exactly T_END */
        t = (n == steps) ? T_END : (double)n * h;
        print_row(t);
    }
    return 0;
}
