/*
 * Optional compiled kernels for the Wigner 3j, 6j and 9j symbols (amalgebra.coupling._racah6j).
 *
 * Same mathematics and same output as the pure-Python kernels
 * amalgebra.coupling.kernels.threej_kernel_python, sixj_kernel_sorted_python and ninej_kernel_python
 * (the 9j by Edmonds 6.4.3 over a common denominator), plus sixj_key, the one-step argument reading,
 * triangle check and canonical key of amalgebra.coupling.sixj: Racah's single sum by a Horner
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
    size_t digits;
    char small[256];
    char *buf;
    PyObject *out;
    if (mpz_fits_slong_p(x))  /* the common case for small j: no text round trip */
        return PyLong_FromLong(mpz_get_si(x));
    digits = mpz_sizeinbase(x, 16) + 2;
    buf = digits <= sizeof(small) ? small : PyMem_Malloc(digits);
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

static PyObject *sixj_core(long a1, long a2, long a3, long a4, long e1, long e2, long e3);

static PyObject *sixj_sorted(PyObject *self, PyObject *args)
{
    long a1, a2, a3, a4, e1, e2, e3;
    (void)self;
    if (!PyArg_ParseTuple(args, "lllllll", &a1, &a2, &a3, &a4, &e1, &e2, &e3))
        return NULL;
    return sixj_core(a1, a2, a3, a4, e1, e2, e3);
}

static PyObject *python_sixj = NULL;  /* the pure-Python kernel, for keys beyond the table */

/* sixj_from_key(key): the 6j from its sorted 7-tuple key; beyond the table the registered
 * pure-Python kernel runs (so an lru cache can wrap this function directly). */
static PyObject *sixj_from_key(PyObject *self, PyObject *key)
{
    long v[7];
    int k, overflow = 0;
    (void)self;
    if (!PyTuple_CheckExact(key) || PyTuple_GET_SIZE(key) != 7) {
        PyErr_SetString(PyExc_TypeError, "sixj_from_key needs a tuple of 7 ints");
        return NULL;
    }
    for (k = 0; k < 7; k++) {
        PyObject *item = PyTuple_GET_ITEM(key, k);
        if (!PyLong_Check(item)) {
            PyErr_SetString(PyExc_TypeError, "sixj_from_key needs a tuple of 7 ints");
            return NULL;
        }
        v[k] = PyLong_AsLongAndOverflow(item, &overflow);
        if (v[k] == -1 && PyErr_Occurred())
            return NULL;
        if (overflow)
            break;
    }
    if (k < 7 || v[6] + 1 > TOP_LIMIT) {
        if (python_sixj == NULL) {
            PyErr_SetString(PyExc_OverflowError, "factorial argument beyond the compiled table");
            return NULL;
        }
        return PyObject_Call(python_sixj, key, NULL);
    }
    return sixj_core(v[0], v[1], v[2], v[3], v[4], v[5], v[6]);
}

static PyObject *register_python_sixj(PyObject *self, PyObject *func)
{
    (void)self;
    if (func != Py_None && !PyCallable_Check(func)) {
        PyErr_SetString(PyExc_TypeError, "register_python_sixj needs a callable or None");
        return NULL;
    }
    Py_XDECREF(python_sixj);
    python_sixj = func == Py_None ? NULL : func;
    Py_XINCREF(python_sixj);
    Py_RETURN_NONE;
}

static PyObject *sixj_core(long a1, long a2, long a3, long a4, long e1, long e2, long e3)
{
    long u, f1, f2, f3, length;
    long acc[TOP_LIMIT];  /* pi(4096) = 564 entries suffice; generous and on the stack */
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


/* Racah's 6j sum from unsorted triad sums a[4] and quadruple sums e[3] (plain ints):
 * out = signed P, and acc += its packed denominator vector (as Racah's sum in kernels.sixj_racah_sum).  Returns 0 when P == 0. */
static int racah_sum(const long *a, const long *e, mpz_t out, long *acc)
{
    long t0 = a[0], t1 = e[0], u;
    int k;
    for (k = 1; k < 4; k++)
        if (a[k] > t0) t0 = a[k];
    for (k = 1; k < 3; k++)
        if (e[k] < t1) t1 = e[k];
    mpz_set_ui(out, 1);
    mpz_set_ui(Q, 1);
    for (u = t1; u > t0; u--) {
#if ULONG_MAX > 0xFFFFFFFFUL
        mpz_mul_ui(Q, Q, (unsigned long)((u - a[0]) * (u - a[1])) * (unsigned long)((u - a[2]) * (u - a[3])));
        mpz_mul_ui(out, out, (unsigned long)((u + 1) * (e[0] + 1 - u))
                   * (unsigned long)((e[1] + 1 - u) * (e[2] + 1 - u)));
#else
        mpz_mul_ui(Q, Q, (unsigned long)((u - a[0]) * (u - a[1])));
        mpz_mul_ui(Q, Q, (unsigned long)((u - a[2]) * (u - a[3])));
        mpz_mul_ui(out, out, (unsigned long)((u + 1) * (e[0] + 1 - u)));
        mpz_mul_ui(out, out, (unsigned long)((e[1] + 1 - u) * (e[2] + 1 - u)));
#endif
        mpz_sub(out, Q, out);
    }
    if (mpz_sgn(out) == 0)
        return 0;
    if (t0 & 1)
        mpz_neg(out, out);
    add_row(acc, (int)(t0 + 1), 1);
    for (k = 0; k < 4; k++)
        add_row(acc, (int)(t1 - a[k]), -1);
    for (k = 0; k < 3; k++)
        add_row(acc, (int)(e[k] - t0), -1);
    return 1;
}

/* acc += weight * Delta(x y z) (doubled values) */
static void add_delta(long *acc, long x, long y, long z, long weight)
{
    add_row(acc, (int)((x + y - z) / 2), weight);
    add_row(acc, (int)((x - y + z) / 2), weight);
    add_row(acc, (int)((y + z - x) / 2), weight);
    add_row(acc, (int)((x + y + z) / 2 + 1), -weight);
}

static int triad_ok(long x, long y, long z)
{
    return x >= 0 && y >= 0 && z >= 0 && ((x + y + z) & 1) == 0 && z <= x + y && z >= labs(x - y);
}

static PyObject *ninej(PyObject *self, PyObject *args)
{
    long a, b, c, d, e, f, g, h, i, lo, hi, top, x, length, nterms = 0, count, k, j;
    long *vectors = NULL, *low = NULL, *acc = NULL;
    mpz_t *coeffs = NULL;
    mpz_t r1, r2, r3, term, total;
    PyObject *result = NULL;
    (void)self;
    if (!PyArg_ParseTuple(args, "lllllllll", &a, &b, &c, &d, &e, &f, &g, &h, &i))
        return NULL;
    if (!(triad_ok(a, b, c) && triad_ok(d, e, f) && triad_ok(g, h, i) && triad_ok(a, d, g)
          && triad_ok(b, e, h) && triad_ok(c, f, i))) {
        PyErr_SetString(PyExc_ValueError, "ninej needs doubled arguments whose rows and columns obey the triangle rule");
        return NULL;
    }
    lo = labs(a - i);
    if (labs(b - f) > lo) lo = labs(b - f);
    if (labs(d - h) > lo) lo = labs(d - h);
    hi = a + i;
    if (b + f < hi) hi = b + f;
    if (d + h < hi) hi = d + h;
    if (lo > hi)
        return Py_BuildValue("(iii)", 0, 1, 1);
    {   /* largest factorial argument: a quadruple sum of one of the three 6j (x at its top) + 1 */
        long q[9] = {a + b + f + i, b + c + i + hi, c + a + hi + f, d + e + b + hi, e + f + hi + h,
                     f + d + h + b, g + h + hi + a, h + i + a + d, i + g + d + hi};
        top = q[0];
        for (k = 1; k < 9; k++)
            if (q[k] > top) top = q[k];
        top = top / 2 + 1;
    }
    if (top > TOP_LIMIT) {
        PyErr_SetString(PyExc_OverflowError, "factorial argument beyond the compiled table");
        return NULL;
    }
    if (ensure_tables((int)top) < 0)
        return PyErr_NoMemory();
    length = pi_count[top];
    count = (hi - lo) / 2 + 1;
    vectors = calloc((size_t)(count * (length ? length : 1)), sizeof(long));
    low = calloc((size_t)(length ? length : 1), sizeof(long));
    acc = calloc((size_t)(length ? length : 1), sizeof(long));
    coeffs = malloc(sizeof(mpz_t) * (size_t)count);
    if (!vectors || !low || !acc || !coeffs) {
        free(vectors); free(low); free(acc); free(coeffs);
        return PyErr_NoMemory();
    }
    mpz_inits(r1, r2, r3, term, total, NULL);
    for (x = lo; x <= hi; x += 2) {
        long *vec = vectors + nterms * length;
        long a1[4] = {(a + b + c) / 2, (a + i + x) / 2, (f + b + x) / 2, (f + i + c) / 2};
        long e1[3] = {(a + b + f + i) / 2, (b + c + i + x) / 2, (c + a + x + f) / 2};
        long a2[4] = {(d + e + f) / 2, (d + x + h) / 2, (b + e + h) / 2, (b + x + f) / 2};
        long e2[3] = {(d + e + b + x) / 2, (e + f + x + h) / 2, (f + d + h + b) / 2};
        long a3[4] = {(g + h + i) / 2, (g + a + d) / 2, (x + h + d) / 2, (x + a + i) / 2};
        long e3[3] = {(g + h + x + a) / 2, (h + i + a + d) / 2, (i + g + d + x) / 2};
        memset(vec, 0, sizeof(long) * (size_t)length);
        if (!racah_sum(a1, e1, r1, vec))
            continue;
        if (!racah_sum(a2, e2, r2, vec)) {
            memset(vec, 0, sizeof(long) * (size_t)length);
            continue;
        }
        if (!racah_sum(a3, e3, r3, vec)) {
            memset(vec, 0, sizeof(long) * (size_t)length);
            continue;
        }
        add_delta(vec, a, i, x, 1);
        add_delta(vec, b, f, x, 1);
        add_delta(vec, d, h, x, 1);
        mpz_init(coeffs[nterms]);
        mpz_mul(coeffs[nterms], r1, r2);
        mpz_mul(coeffs[nterms], coeffs[nterms], r3);
        mpz_mul_ui(coeffs[nterms], coeffs[nterms], (unsigned long)(x + 1));
        if (x & 1)
            mpz_neg(coeffs[nterms], coeffs[nterms]);
        if (nterms == 0)
            memcpy(low, vec, sizeof(long) * (size_t)length);
        else
            for (j = 0; j < length; j++)
                if (vec[j] < low[j]) low[j] = vec[j];
        nterms++;
    }
    if (nterms == 0) {
        result = Py_BuildValue("(iii)", 0, 1, 1);
        goto done;
    }
    mpz_set_ui(total, 0);
    for (k = 0; k < nterms; k++) {
        const long *vec = vectors + k * length;
        mpz_set(term, coeffs[k]);
        for (j = 0; j < length; j++)
            if (vec[j] != low[j])
                mul_prime_power(term, (unsigned long)primes[j], vec[j] - low[j]);
        mpz_add(total, total, term);
    }
    if (mpz_sgn(total) == 0) {
        result = Py_BuildValue("(iii)", 0, 1, 1);
        goto done;
    }
    for (j = 0; j < length; j++)
        acc[j] = 2 * low[j];
    add_delta(acc, a, b, c, 1);
    add_delta(acc, d, e, f, 1);
    add_delta(acc, g, h, i, 1);
    add_delta(acc, a, d, g, 1);
    add_delta(acc, b, e, h, 1);
    add_delta(acc, c, f, i, 1);
    mpz_set(P, total);
    result = finish(acc, length);
done:
    for (k = 0; k < nterms; k++)
        mpz_clear(coeffs[k]);
    mpz_clears(r1, r2, r3, term, total, NULL);
    free(vectors); free(low); free(acc); free(coeffs);
    return result;
}

/* ---- sixj_key: read six plain numbers, check the triangle rules, build the sorted key ---- */

static PyObject *rational_type = NULL;  /* sympy.Rational, registered by amalgebra.coupling.coefficients */
static PyObject *str_p = NULL, *str_q = NULL;
static long fast_max = 2000;            /* largest doubled j sixj_key serves (kept <= 2 * TOP_LIMIT / 4) */

/* 1: *out = doubled value of a plain nonnegative int or SymPy integer/half-integer within fast_max;
 * 0: anything else (the caller takes the validating route); -1: a Python error. */
static int read_doubled(PyObject *o, long *out)
{
    int overflow = 0;
    long v;
    if (PyLong_CheckExact(o)) {
        v = PyLong_AsLongAndOverflow(o, &overflow);
        if (v == -1 && PyErr_Occurred())
            return -1;
        if (overflow || v < 0 || v > fast_max / 2)
            return 0;
        *out = 2 * v;
        return 1;
    }
    if (rational_type != NULL && PyObject_TypeCheck(o, (PyTypeObject *)rational_type)) {
        PyObject *p = PyObject_GetAttr(o, str_p), *q;
        long pv, qv;
        if (!p)
            return -1;
        q = PyObject_GetAttr(o, str_q);
        if (!q) {
            Py_DECREF(p);
            return -1;
        }
        if (!PyLong_Check(p) || !PyLong_Check(q)) {
            Py_DECREF(p); Py_DECREF(q);
            return 0;
        }
        pv = PyLong_AsLongAndOverflow(p, &overflow);
        Py_DECREF(p);
        if (pv == -1 && PyErr_Occurred()) {
            Py_DECREF(q);
            return -1;
        }
        if (overflow) {
            Py_DECREF(q);
            return 0;
        }
        qv = PyLong_AsLongAndOverflow(q, &overflow);
        Py_DECREF(q);
        if (qv == -1 && PyErr_Occurred())
            return -1;
        if (overflow || (qv != 1 && qv != 2) || pv < 0 || pv > fast_max)
            return 0;
        v = qv == 1 ? 2 * pv : pv;
        if (v > fast_max)
            return 0;
        *out = v;
        return 1;
    }
    return 0;
}

static void sort_longs(long *v, int n)
{
    int i, j;
    for (i = 1; i < n; i++) {
        long key = v[i];
        for (j = i - 1; j >= 0 && v[j] > key; j--)
            v[j + 1] = v[j];
        v[j + 1] = key;
    }
}

static PyObject *sixj_key(PyObject *self, PyObject *const *args, Py_ssize_t nargs)
{
    long t[6], al[4], be[3];
    PyObject *out;
    int k, r;
    (void)self;
    if (nargs != 6) {
        PyErr_SetString(PyExc_TypeError, "sixj_key takes exactly 6 arguments");
        return NULL;
    }
    for (k = 0; k < 6; k++) {
        r = read_doubled(args[k], &t[k]);
        if (r < 0)
            return NULL;
        if (r == 0)
            Py_RETURN_NONE;
    }
    al[0] = t[0] + t[1] + t[2]; al[1] = t[0] + t[4] + t[5]; al[2] = t[3] + t[1] + t[5]; al[3] = t[3] + t[4] + t[2];
    if (((al[0] | al[1] | al[2] | al[3]) & 1) || t[2] > t[0] + t[1] || t[2] < labs(t[0] - t[1])
            || t[5] > t[0] + t[4] || t[5] < labs(t[0] - t[4]) || t[5] > t[3] + t[1] || t[5] < labs(t[3] - t[1])
            || t[2] > t[3] + t[4] || t[2] < labs(t[3] - t[4]))
        return PyLong_FromLong(0);
    for (k = 0; k < 4; k++)
        al[k] /= 2;
    be[0] = (t[0] + t[1] + t[3] + t[4]) / 2;
    be[1] = (t[1] + t[2] + t[4] + t[5]) / 2;
    be[2] = (t[2] + t[0] + t[5] + t[3]) / 2;
    sort_longs(al, 4);
    sort_longs(be, 3);
    out = PyTuple_New(7);
    if (!out)
        return NULL;
    for (k = 0; k < 7; k++) {
        PyObject *item = PyLong_FromLong(k < 4 ? al[k] : be[k - 4]);
        if (!item) {
            Py_DECREF(out);
            return NULL;
        }
        PyTuple_SET_ITEM(out, k, item);
    }
    return out;
}

/* 1: *out = doubled value (any sign) of a plain int or SymPy integer/half-integer with |2v| <= fast_max;
 * 0: anything else; -1: a Python error. */
static int read_doubled_signed(PyObject *o, long *out)
{
    int overflow = 0;
    long v;
    if (PyLong_CheckExact(o)) {
        v = PyLong_AsLongAndOverflow(o, &overflow);
        if (v == -1 && PyErr_Occurred())
            return -1;
        if (overflow || v > fast_max / 2 || v < -(fast_max / 2))
            return 0;
        *out = 2 * v;
        return 1;
    }
    if (rational_type != NULL && PyObject_TypeCheck(o, (PyTypeObject *)rational_type)) {
        /* reuse the nonnegative reader on |value| by reading p and q here */
        PyObject *p = PyObject_GetAttr(o, str_p), *q;
        long pv, qv;
        if (!p)
            return -1;
        q = PyObject_GetAttr(o, str_q);
        if (!q) {
            Py_DECREF(p);
            return -1;
        }
        if (!PyLong_Check(p) || !PyLong_Check(q)) {
            Py_DECREF(p); Py_DECREF(q);
            return 0;
        }
        pv = PyLong_AsLongAndOverflow(p, &overflow);
        Py_DECREF(p);
        if (pv == -1 && PyErr_Occurred()) {
            Py_DECREF(q);
            return -1;
        }
        if (overflow) {
            Py_DECREF(q);
            return 0;
        }
        qv = PyLong_AsLongAndOverflow(q, &overflow);
        Py_DECREF(q);
        if (qv == -1 && PyErr_Occurred())
            return -1;
        if (overflow || (qv != 1 && qv != 2) || pv > fast_max || pv < -fast_max)
            return 0;
        v = qv == 1 ? 2 * pv : pv;
        if (v > fast_max || v < -fast_max)
            return 0;
        *out = v;
        return 1;
    }
    return 0;
}

static int tuple_less(const long *x, const long *y, int n)
{
    int k;
    for (k = 0; k < n; k++)
        if (x[k] != y[k])
            return x[k] < y[k];
    return 0;
}

/* threej_key(j1, j2, j3, m1, m2, m3) -> ((low, p, q, u, v), negate) | 0 | None: the canonical Regge key
 * of symmetry.threej_key and whether the value is minus the canonical one; 0 for a selection-rule
 * zero; None when an argument is not plain (or j - m is not an integer: the caller raises). */
/* The key of the 3j with doubled t = (j1, j2, j3, m1, m2, m3), parities already checked: 0 (a
 * selection-rule zero) or ((low, p, q, u, v), negate XOR flip). */
static PyObject *threej_key_core(const long *t, int flip)
{
    static const int others[3][2] = {{1, 2}, {0, 2}, {0, 1}};
    long sq[9], best[5] = {0, 0, 0, 0, 0}, cand[8][5], low;
    int k, pos, have = 0, negate;
    PyObject *key;
    if (t[3] + t[4] + t[5] != 0 || ((t[0] + t[1] + t[2]) & 1) || t[2] > t[0] + t[1] || t[2] < labs(t[0] - t[1])
            || labs(t[3]) > t[0] || labs(t[4]) > t[1] || labs(t[5]) > t[2]
            || (t[3] == 0 && t[4] == 0 && ((t[0] + t[1] + t[2]) / 2) & 1))
        return PyLong_FromLong(0);
    sq[0] = (t[1] + t[2] - t[0]) / 2; sq[1] = (t[0] - t[1] + t[2]) / 2; sq[2] = (t[0] + t[1] - t[2]) / 2;
    sq[3] = (t[0] - t[3]) / 2; sq[4] = (t[1] - t[4]) / 2; sq[5] = (t[2] - t[5]) / 2;
    sq[6] = (t[0] + t[3]) / 2; sq[7] = (t[1] + t[4]) / 2; sq[8] = (t[2] + t[5]) / 2;
    low = sq[0];
    for (k = 1; k < 9; k++)
        if (sq[k] < low) low = sq[k];
    for (pos = 0; pos < 9; pos++) {
        int row = pos / 3, col = pos % 3, r1, r2, c1, c2, even, odd, i;
        long p, q, u, v;
        if (sq[pos] != low)
            continue;
        r1 = others[row][0]; r2 = others[row][1]; c1 = others[col][0]; c2 = others[col][1];
        p = sq[3 * r1 + c1]; q = sq[3 * r1 + c2]; u = sq[3 * r2 + c1]; v = sq[3 * r2 + c2];
        even = (row + col) & 1; odd = (row + col + 1) & 1;
        {
            long c[8][5] = {{p, q, u, v, even}, {u, v, p, q, odd}, {q, p, v, u, odd}, {v, u, q, p, even},
                            {p, u, q, v, even}, {u, p, v, q, odd}, {q, v, p, u, odd}, {v, q, u, p, even}};
            memcpy(cand, c, sizeof(c));
        }
        for (i = 0; i < 8; i++)
            if (!have || tuple_less(cand[i], best, 5)) {
                memcpy(best, cand[i], sizeof(best));
                have = 1;
            }
    }
    negate = (best[4] && (((t[0] + t[1] + t[2]) / 2) & 1)) ^ flip;
    key = Py_BuildValue("(lllll)", low, best[0], best[1], best[2], best[3]);
    if (!key)
        return NULL;
    return Py_BuildValue("(NO)", key, negate ? Py_True : Py_False);
}

/* Read six arguments: kinds[k] = 1 for a j (nonnegative), 0 for a projection.  1 ok, 0 not plain, -1 error. */
static int read_six(PyObject *const *args, Py_ssize_t nargs, const int *kinds, long *t, const char *name)
{
    int k, r;
    if (nargs != 6) {
        PyErr_Format(PyExc_TypeError, "%s takes exactly 6 arguments", name);
        return -1;
    }
    for (k = 0; k < 6; k++) {
        r = kinds[k] ? read_doubled(args[k], &t[k]) : read_doubled_signed(args[k], &t[k]);
        if (r <= 0)
            return r;
    }
    return 1;
}

static PyObject *threej_key(PyObject *self, PyObject *const *args, Py_ssize_t nargs)
{
    static const int kinds[6] = {1, 1, 1, 0, 0, 0};
    long t[6];
    int k, r;
    (void)self;
    r = read_six(args, nargs, kinds, t, "threej_key");
    if (r < 0)
        return NULL;
    if (r == 0)
        Py_RETURN_NONE;
    for (k = 0; k < 3; k++)
        if ((t[k] - t[k + 3]) & 1)
            Py_RETURN_NONE;  /* j - m not an integer: the validating route raises ProjectionError */
    return threej_key_core(t, 0);
}

/* cg_key(j1, m1, j2, m2, J, M) -> (key, negate, 2J) | 0 | 1 | None: the 3j key of
 * <j1 m1 j2 m2|J M> = (-1)^(j1-j2+M) sqrt(2J+1) (j1 j2 J; m1 m2 -M), with the whole sign in negate;
 * 0 for a selection-rule zero, 1 for the coefficients that are exactly 1. */
static PyObject *cg_key(PyObject *self, PyObject *const *args, Py_ssize_t nargs)
{
    static const int kinds[6] = {1, 0, 1, 0, 1, 0};
    long v[6], t[6];
    int r;
    PyObject *core, *out;
    (void)self;
    r = read_six(args, nargs, kinds, v, "cg_key");
    if (r < 0)
        return NULL;
    if (r == 0)
        Py_RETURN_NONE;
    if (((v[0] - v[1]) & 1) || ((v[2] - v[3]) & 1) || ((v[4] - v[5]) & 1))
        Py_RETURN_NONE;
    if (v[1] + v[3] != v[5])
        return PyLong_FromLong(0);
    if (!(((v[0] + v[2] + v[4]) & 1) == 0 && v[4] <= v[0] + v[2] && v[4] >= labs(v[0] - v[2])
          && labs(v[1]) <= v[0] && labs(v[3]) <= v[2] && labs(v[5]) <= v[4]))
        return PyLong_FromLong(0);
    if (v[0] == 0 || v[2] == 0 || (v[4] == v[0] + v[2] && labs(v[5]) == v[4]))
        return PyLong_FromLong(1);
    t[0] = v[0]; t[1] = v[2]; t[2] = v[4]; t[3] = v[1]; t[4] = v[3]; t[5] = -v[5];
    core = threej_key_core(t, (int)((((v[0] - v[2] + v[5]) / 2) % 2 + 2) % 2));
    if (!core || !PyTuple_Check(core))
        return core;
    out = Py_BuildValue("(OOl)", PyTuple_GET_ITEM(core, 0), PyTuple_GET_ITEM(core, 1), v[4]);
    Py_DECREF(core);
    return out;
}

static PyObject *register_rational(PyObject *self, PyObject *args)
{
    PyObject *cls;
    long limit;
    (void)self;
    if (!PyArg_ParseTuple(args, "Ol", &cls, &limit))
        return NULL;
    if (cls != Py_None && !PyType_Check(cls)) {
        PyErr_SetString(PyExc_TypeError, "register_rational needs a type or None");
        return NULL;
    }
    if (limit < 0 || limit > 2 * TOP_LIMIT) {
        PyErr_SetString(PyExc_ValueError, "register_rational: limit out of range");
        return NULL;
    }
    Py_XDECREF(rational_type);
    rational_type = cls == Py_None ? NULL : cls;
    Py_XINCREF(rational_type);
    fast_max = limit;
    Py_RETURN_NONE;
}

static PyMethodDef methods[] = {
    {"sixj_sorted", sixj_sorted, METH_VARARGS,
     "sixj_sorted(a1, a2, a3, a4, e1, e2, e3) -> (n, d, s): the 6j symbol from its sorted triad sums "
     "a1<=...<=a4 and sorted quadruple sums e1<=e2<=e3 (all triangle rules assumed), as n/d*sqrt(s)."},
    {"threej", threej, METH_VARARGS,
     "threej(tj1, tj2, tj3, tm1, tm2, tm3) -> (n, d, s): the 3j symbol from doubled arguments obeying "
     "every selection rule, as n/d*sqrt(s)."},
    {"ninej", ninej, METH_VARARGS,
     "ninej(a, b, c, d, e, f, g, h, i) -> (n, d, s): the 9j symbol {a b c; d e f; g h i} from doubled "
     "arguments whose rows and columns obey the triangle rule, as n/d*sqrt(s)."},
    {"sixj_key", (PyCFunction)(void (*)(void))sixj_key, METH_FASTCALL,
     "sixj_key(j1, ..., j6) -> key, 0 or None: the sorted key (a1..a4, e1..e3) of a 6j given as plain "
     "nonnegative ints or registered SymPy numbers, 0 when a triangle rule fails, None when an argument "
     "is anything else or beyond the fast limit (the caller then validates in Python)."},
    {"threej_key", (PyCFunction)(void (*)(void))threej_key, METH_FASTCALL,
     "threej_key(j1, j2, j3, m1, m2, m3) -> (key, negate), 0 or None: the canonical Regge key of a 3j given "
     "as plain ints or registered SymPy numbers and whether the value is minus the canonical one; 0 for a "
     "selection-rule zero; None when an argument is anything else (the caller validates in Python)."},
    {"cg_key", (PyCFunction)(void (*)(void))cg_key, METH_FASTCALL,
     "cg_key(j1, m1, j2, m2, J, M) -> (key, negate, 2J), 0, 1 or None: the 3j key of a Clebsch-Gordan "
     "coefficient with its whole sign; 0 for a selection-rule zero, 1 for a coefficient exactly 1, None "
     "when an argument is not plain."},
    {"sixj_from_key", sixj_from_key, METH_O,
     "sixj_from_key(key) -> (n, d, s): the 6j from its sorted key (a1, a2, a3, a4, e1, e2, e3); beyond "
     "the compiled table the function given to register_python_sixj runs."},
    {"register_python_sixj", register_python_sixj, METH_O,
     "register_python_sixj(func) -> None: the pure-Python 6j kernel sixj_from_key calls beyond its table."},
    {"register_rational", register_rational, METH_VARARGS,
     "register_rational(cls, limit) -> None: the SymPy Rational class sixj_key reads (or None), and "
     "the largest doubled j it serves."},
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
    if (!str_p) {
        str_p = PyUnicode_InternFromString("p");
        str_q = PyUnicode_InternFromString("q");
        if (!str_p || !str_q) {
            Py_DECREF(m);
            return NULL;
        }
    }
    if (PyModule_AddIntConstant(m, "TOP_LIMIT", TOP_LIMIT) < 0) {
        Py_DECREF(m);
        return NULL;
    }
    names = Py_BuildValue("[sssssssssss]", "sixj_sorted", "threej", "ninej", "sixj_key", "threej_key", "cg_key", "sixj_from_key",
                          "register_python_sixj", "register_rational", "clear", "TOP_LIMIT");
    if (!names || PyModule_AddObject(m, "__all__", names) < 0) {
        Py_XDECREF(names);
        Py_DECREF(m);
        return NULL;
    }
    return m;
}
