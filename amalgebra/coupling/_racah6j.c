/*
 * Optional compiled kernels for the Wigner 3j and 6j symbols (amalgebra.coupling._racah6j).
 *
 * Same mathematics and same output as the pure-Python kernels
 * amalgebra.coupling.kernels.threej_kernel_python and sixj_kernel_sorted_python: Racah's single sum by a Horner
 * scheme on the ratio of consecutive terms (one integer P, no division), and the
 * radicand as an exponent vector over the primes, summed from a table of the
 * exponent vectors of n! (Legendre).  The canonical triple (n, d, s) means
 * n/d * sqrt(s) with d > 0, gcd(n, d) = 1 and s squarefree.
 *
 * Big integers are GMP mpz_t; the result crosses into Python as hexadecimal
 * digit strings (exact).  The interpreter lock is held throughout, so the
 * module-level tables and scratch integers need no further locking.
 */
#define PY_SSIZE_T_CLEAN
#include <Python.h>
#include <gmp.h>
#include <limits.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

/* Largest factorial argument served; callers fall back to Python above it. */
#define TOP_LIMIT 4096

static int *primes = NULL;      /* primes <= table_top */
static int *pi_count = NULL;    /* pi_count[n] = number of primes <= n */
static int *spf = NULL;         /* smallest prime factor */
static int *prime_index = NULL; /* prime_index[p] = position of p in primes */
static int32_t *fact_exp = NULL;   /* rows: exponent vector of n!, row n has pi_count[n] entries */
static size_t *row_start = NULL;   /* offset of row n in fact_exp */
static int table_top = -1;      /* rows 0..table_top exist */

static mpz_t P, Q, NUM, DEN, SQF, G;
static int scratch_ready = 0;

static void free_tables(void)
{
    free(primes); free(pi_count); free(spf); free(prime_index); free(fact_exp); free(row_start);
    primes = NULL; pi_count = NULL; spf = NULL; prime_index = NULL; fact_exp = NULL; row_start = NULL;
    table_top = -1;
}

/* Build every table for factorial arguments 0..top (top <= TOP_LIMIT). */
static int build_tables(int top)
{
    int size = top + 1, count = 0, n, p, m;
    size_t total = 0, offset;
    free_tables();
    spf = calloc((size_t)size, sizeof(int));
    pi_count = calloc((size_t)size, sizeof(int));
    prime_index = calloc((size_t)size, sizeof(int));
    primes = calloc((size_t)size, sizeof(int));
    row_start = calloc((size_t)size, sizeof(size_t));
    if (!spf || !pi_count || !prime_index || !primes || !row_start) {
        free_tables();
        return -1;
    }
    for (n = 2; n < size; n++) {
        if (spf[n] == 0) {
            prime_index[n] = count;
            primes[count++] = n;
            for (m = n; m < size; m += n)
                if (spf[m] == 0)
                    spf[m] = n;
        }
        pi_count[n] = count;
    }
    for (n = 0; n < size; n++) {
        row_start[n] = total;
        total += (size_t)pi_count[n];
    }
    fact_exp = calloc(total ? total : 1, sizeof(int32_t));
    if (!fact_exp) {
        free_tables();
        return -1;
    }
    for (n = 2; n < size; n++) {
        offset = row_start[n];
        /* row n = row n-1 (shorter by at most one entry) plus the factorisation of n */
        memcpy(fact_exp + offset, fact_exp + row_start[n - 1], sizeof(int32_t) * (size_t)pi_count[n - 1]);
        for (m = n; m > 1; m /= p) {
            p = spf[m];
            fact_exp[offset + (size_t)prime_index[p]] += 1;
        }
    }
    table_top = top;
    return 0;
}

static int ensure_tables(int top)
{
    int target;
    if (top <= table_top)
        return 0;
    target = 2 * top;
    if (target < 256)
        target = 256;
    if (target > TOP_LIMIT)
        target = TOP_LIMIT;
    return build_tables(target);
}

/* acc += weight * (exponent vector of n!) over the first `length` primes. */
static void add_row(long *acc, int n, long weight)
{
    const int32_t *row = fact_exp + row_start[n];
    int i, len = pi_count[n];
    for (i = 0; i < len; i++)
        acc[i] += weight * row[i];
}

/* target *= p^e (e > 0), multiplying in word-sized chunks. */
static void mul_prime_power(mpz_t target, unsigned long p, long e)
{
    unsigned long chunk = 1;
    const unsigned long limit = (unsigned long)-1 / p;
    while (e-- > 0) {
        if (chunk > limit) {
            mpz_mul_ui(target, target, chunk);
            chunk = 1;
        }
        chunk *= p;
    }
    if (chunk != 1)
        mpz_mul_ui(target, target, chunk);
}

static PyObject *mpz_to_pylong(const mpz_t x)
{
    size_t digits = mpz_sizeinbase(x, 16) + 2;
    char small[256];
    char *buf = digits <= sizeof(small) ? small : PyMem_Malloc(digits);
    PyObject *out;
    if (!buf)
        return PyErr_NoMemory();
    mpz_get_str(buf, 16, x);
    out = PyLong_FromString(buf, NULL, 16);
    if (buf != small)
        PyMem_Free(buf);
    return out;
}

/* The canonical triple of P * sqrt(prod p^acc[i]) over the first `length` primes. */
static PyObject *finish(const long *acc, long length)
{
    long i;
    PyObject *n_obj, *d_obj, *s_obj;
    mpz_set(NUM, P);
    mpz_set_ui(DEN, 1);
    mpz_set_ui(SQF, 1);
    for (i = 0; i < length; i++) {
        long e = acc[i], half = e >> 1;  /* arithmetic shift: floor(e / 2) */
        unsigned long p = (unsigned long)primes[i];
        if (e & 1)
            mpz_mul_ui(SQF, SQF, p);
        if (half > 0)
            mul_prime_power(NUM, p, half);
        else if (half < 0)
            mul_prime_power(DEN, p, -half);
    }
    mpz_gcd(G, NUM, DEN);
    if (mpz_cmp_ui(G, 1) != 0) {
        mpz_divexact(NUM, NUM, G);
        mpz_divexact(DEN, DEN, G);
    }
    n_obj = mpz_to_pylong(NUM);
    d_obj = n_obj ? mpz_to_pylong(DEN) : NULL;
    s_obj = d_obj ? mpz_to_pylong(SQF) : NULL;
    if (!s_obj) {
        Py_XDECREF(n_obj);
        Py_XDECREF(d_obj);
        return NULL;
    }
    return Py_BuildValue("(NNN)", n_obj, d_obj, s_obj);
}

/* P *= a * b * c for nonnegative factors below TOP_LIMIT. */
static void mul3(mpz_t target, long a, long b, long c)
{
#if ULONG_MAX > 0xFFFFFFFFUL
    mpz_mul_ui(target, target, (unsigned long)a * (unsigned long)b * (unsigned long)c);
#else
    mpz_mul_ui(target, target, (unsigned long)a * (unsigned long)b);
    mpz_mul_ui(target, target, (unsigned long)c);
#endif
}

static PyObject *threej(PyObject *self, PyObject *args)
{
    long tj1, tj2, tj3, tm1, tm2, tm3, big, b1, b2, b3, c1, c2, kmin, kmax, k;
    long acc[TOP_LIMIT];
    (void)self;
    if (!PyArg_ParseTuple(args, "llllll", &tj1, &tj2, &tj3, &tm1, &tm2, &tm3))
        return NULL;
    /* selection rules are the caller's job; check only what keeps the arithmetic in range */
    if (tj1 < 0 || tj2 < 0 || tj3 < 0 || labs(tm1) > tj1 || labs(tm2) > tj2 || labs(tm3) > tj3
            || tm1 + tm2 + tm3 != 0 || (tj1 + tj2 + tj3) & 1 || (tj1 + tm1) & 1 || (tj2 + tm2) & 1
            || (tj3 + tm3) & 1 || tj3 > tj1 + tj2 || tj3 < labs(tj1 - tj2)) {
        PyErr_SetString(PyExc_ValueError, "threej needs doubled arguments obeying every selection rule");
        return NULL;
    }
    big = (tj1 + tj2 + tj3) / 2 + 1;
    if (big > TOP_LIMIT) {
        PyErr_SetString(PyExc_OverflowError, "factorial argument beyond the compiled table");
        return NULL;
    }
    if (ensure_tables((int)big) < 0)
        return PyErr_NoMemory();
    b1 = (tj1 + tj2 - tj3) / 2;
    b2 = (tj1 - tm1) / 2;
    b3 = (tj2 + tm2) / 2;
    c1 = (tj3 - tj2 + tm1) / 2;
    c2 = (tj3 - tj1 - tm2) / 2;
    kmin = 0;
    if (-c1 > kmin) kmin = -c1;
    if (-c2 > kmin) kmin = -c2;
    kmax = b1 < b2 ? b1 : b2;
    if (b3 < kmax) kmax = b3;
    if (kmin > kmax)
        return Py_BuildValue("(iii)", 0, 1, 1);
    /* Racah's 3j sum over k = kmax-1 .. kmin (Horner on the ratio of consecutive terms) */
    mpz_set_ui(P, 1);
    mpz_set_ui(Q, 1);
    for (k = kmax - 1; k >= kmin; k--) {
        mul3(Q, k + 1, c1 + k + 1, c2 + k + 1);
        mul3(P, b1 - k, b2 - k, b3 - k);
        mpz_sub(P, Q, P);
    }
    if (mpz_sgn(P) == 0)
        return Py_BuildValue("(iii)", 0, 1, 1);
    if ((((tj1 - tj2 - tm3) / 2 + kmin) % 2 + 2) % 2)
        mpz_neg(P, P);
    memset(acc, 0, sizeof(long) * (size_t)pi_count[big]);
    add_row(acc, (int)b1, 1);
    add_row(acc, (int)((tj1 - tj2 + tj3) / 2), 1);
    add_row(acc, (int)((tj2 + tj3 - tj1) / 2), 1);
    add_row(acc, (int)big, -1);
    add_row(acc, (int)b2, 1);
    add_row(acc, (int)((tj1 + tm1) / 2), 1);
    add_row(acc, (int)((tj2 - tm2) / 2), 1);
    add_row(acc, (int)b3, 1);
    add_row(acc, (int)((tj3 - tm3) / 2), 1);
    add_row(acc, (int)((tj3 + tm3) / 2), 1);
    add_row(acc, (int)kmax, -2);
    add_row(acc, (int)(c1 + kmax), -2);
    add_row(acc, (int)(c2 + kmax), -2);
    add_row(acc, (int)(b1 - kmin), -2);
    add_row(acc, (int)(b2 - kmin), -2);
    add_row(acc, (int)(b3 - kmin), -2);
    return finish(acc, pi_count[big]);
}

static PyObject *sixj_sorted(PyObject *self, PyObject *args)
{
    long a1, a2, a3, a4, e1, e2, e3, u, f1, f2, f3, length;
    long acc[TOP_LIMIT];  /* pi(4096) = 564 entries suffice; generous and on the stack */
    (void)self;
    if (!PyArg_ParseTuple(args, "lllllll", &a1, &a2, &a3, &a4, &e1, &e2, &e3))
        return NULL;
    if (!(0 <= a1 && a1 <= a2 && a2 <= a3 && a3 <= a4 && a4 <= e1 && e1 <= e2 && e2 <= e3)) {
        PyErr_SetString(PyExc_ValueError, "sixj_sorted needs a1<=a2<=a3<=a4<=e1<=e2<=e3, all >= 0");
        return NULL;
    }
    if (e3 + 1 > TOP_LIMIT) {
        PyErr_SetString(PyExc_OverflowError, "factorial argument beyond the compiled table");
        return NULL;
    }
    if (ensure_tables((int)(e3 + 1)) < 0)
        return PyErr_NoMemory();

    /* Racah sum over u = e1 .. a4+1 (Horner on the ratio of consecutive terms) */
    f1 = e1 + 1; f2 = e2 + 1; f3 = e3 + 1;
    mpz_set_ui(P, 1);
    mpz_set_ui(Q, 1);
    for (u = e1; u > a4; u--) {
#if ULONG_MAX > 0xFFFFFFFFUL
        mpz_mul_ui(Q, Q, (unsigned long)((u - a1) * (u - a2)) * (unsigned long)((u - a3) * (u - a4)));
        mpz_mul_ui(P, P, (unsigned long)((u + 1) * (f1 - u)) * (unsigned long)((f2 - u) * (f3 - u)));
#else   /* 32-bit unsigned long: each pair product (< 2^25) fits, their product may not */
        mpz_mul_ui(Q, Q, (unsigned long)((u - a1) * (u - a2)));
        mpz_mul_ui(Q, Q, (unsigned long)((u - a3) * (u - a4)));
        mpz_mul_ui(P, P, (unsigned long)((u + 1) * (f1 - u)));
        mpz_mul_ui(P, P, (unsigned long)((f2 - u) * (f3 - u)));
#endif
        mpz_sub(P, Q, P);
    }
    if (mpz_sgn(P) == 0)
        return Py_BuildValue("(iii)", 0, 1, 1);
    if (a4 & 1)
        mpz_neg(P, P);

    /* radicand: the Racah denominator squared times the four triangle coefficients */
    length = pi_count[e3 + 1];
    memset(acc, 0, sizeof(long) * (size_t)length);
    add_row(acc, (int)(a4 + 1), 1);
    add_row(acc, (int)(a1 + 1), -1);
    add_row(acc, (int)(a2 + 1), -1);
    add_row(acc, (int)(a3 + 1), -1);
    add_row(acc, (int)(e1 - a1), -1);
    add_row(acc, (int)(e1 - a2), -1);
    add_row(acc, (int)(e1 - a3), -1);
    add_row(acc, (int)(e1 - a4), -3);
    add_row(acc, (int)(e2 - a1), 1);
    add_row(acc, (int)(e2 - a2), 1);
    add_row(acc, (int)(e2 - a3), 1);
    add_row(acc, (int)(e2 - a4), -1);
    add_row(acc, (int)(e3 - a1), 1);
    add_row(acc, (int)(e3 - a2), 1);
    add_row(acc, (int)(e3 - a3), 1);
    add_row(acc, (int)(e3 - a4), -1);

    return finish(acc, length);
}

static PyObject *clear(PyObject *self, PyObject *unused)
{
    (void)self; (void)unused;
    free_tables();
    Py_RETURN_NONE;
}

static PyMethodDef methods[] = {
    {"sixj_sorted", sixj_sorted, METH_VARARGS,
     "sixj_sorted(a1, a2, a3, a4, e1, e2, e3) -> (n, d, s): the 6j symbol from its sorted triad sums "
     "a1<=...<=a4 and sorted quadruple sums e1<=e2<=e3 (all triangle rules assumed), as n/d*sqrt(s)."},
    {"threej", threej, METH_VARARGS,
     "threej(tj1, tj2, tj3, tm1, tm2, tm3) -> (n, d, s): the 3j symbol from doubled arguments obeying "
     "every selection rule, as n/d*sqrt(s)."},
    {"clear", clear, METH_NOARGS, "clear() -> None: free the prime and factorial tables."},
    {NULL, NULL, 0, NULL}
};

static struct PyModuleDef module = {
    PyModuleDef_HEAD_INIT, "_racah6j",
    "Optional compiled 6j kernel; see amalgebra.coupling.kernels for the pure-Python reference.",
    -1, methods, NULL, NULL, NULL, NULL
};

PyMODINIT_FUNC PyInit__racah6j(void)
{
    PyObject *names, *m = PyModule_Create(&module);
    if (!m)
        return NULL;
    if (!scratch_ready) {
        mpz_inits(P, Q, NUM, DEN, SQF, G, NULL);
        scratch_ready = 1;
    }
    if (PyModule_AddIntConstant(m, "TOP_LIMIT", TOP_LIMIT) < 0) {
        Py_DECREF(m);
        return NULL;
    }
    names = Py_BuildValue("[ssss]", "sixj_sorted", "threej", "clear", "TOP_LIMIT");
    if (!names || PyModule_AddObject(m, "__all__", names) < 0) {
        Py_XDECREF(names);
        Py_DECREF(m);
        return NULL;
    }
    return m;
}
