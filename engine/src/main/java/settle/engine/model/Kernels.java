package settle.engine.model;

/**
 * The dense products behind the models' batch passes, over flat row-major arrays with explicit offsets.
 *
 * <p>Exactness contract: every output element is one chain of fused multiply-adds ({@link Math#fma}, a single
 * rounding each) taken in ascending order of the summed index, starting from the given initial value. Lanes of
 * a vector, rows of a register block and columns of a tile are different output elements, never parts of one
 * sum, so the result is the same bit for bit whatever the vector width, the blocking or the path: the vector
 * path ({@code jdk.incubator.vector}, used when the JVM was started with
 * {@code --add-modules jdk.incubator.vector}) and the scalar fallback agree exactly (tolerance 0).
 *
 * <p>The vector path is on when the module is present and the system property {@code settle.kernels} is not
 * {@code scalar}; {@link #vectorised()} tells which path runs. Nothing here allocates.
 */
public final class Kernels {

    /** True when the vector path runs (decided once, at class initialisation). */
    private static final boolean VECTOR = decideVector();

    /**
     * The vector path takes products whose lane dimension has at least one full register block (2 vectors);
     * narrower ones run scalar (same results; the vector setup would cost more than it saves, and code the JIT has
     * not compiled yet boxes vectors), except the forward product of a narrow layer over at least this many rows.
     */
    private static final int VECTOR_COLUMNS = VECTOR ? 2 * VectorKernels.lanes() : Integer.MAX_VALUE;

    private Kernels() {
    }

    private static boolean decideVector() {
        if ("scalar".equals(System.getProperty("settle.kernels"))) {
            return false;
        }
        if (ModuleLayer.boot().findModule("jdk.incubator.vector").isEmpty()) {
            return false;
        }
        try {
            return VectorKernels.usable();
        } catch (LinkageError e) {
            return false;
        }
    }

    /** @return true when the products run on the vector path, false on the scalar fallback */
    public static boolean vectorised() {
        return VECTOR;
    }

    /** @return a short description of the path, e.g. "vector, 4 doubles per lane group" or "scalar" */
    public static String describe() {
        return VECTOR ? "vector (jdk.incubator.vector), " + VectorKernels.lanes() + " doubles per vector" : "scalar";
    }

    /**
     * C (n × m) = init + A (n × k) · B (k × m): {@code c[r][j] = fma(a[r][k−1], b[k−1][j], … fma(a[r][0],
     * b[0][j], init[j]))}, i ascending.
     *
     * @param a A, row r at {@code aOffset + r·k}; not modified
     * @param b B, row i at {@code bOffset + i·m}; not modified
     * @param init m starting values from {@code initOffset} (e.g. biases), or null for zeros; not modified
     * @param c C, row r at {@code cOffset + r·m}; modified (overwritten), must not overlap A, B or init
     */
    public static void product(double[] a, int aOffset, int n, int k, double[] b, int bOffset, int m,
            double[] init, int initOffset, double[] c, int cOffset) {
        if (VECTOR && m >= VECTOR_COLUMNS) {
            VectorKernels.product(a, aOffset, n, k, b, bOffset, m, init, initOffset, c, cOffset);
        } else {
            scalarProduct(a, aOffset, n, k, b, bOffset, m, init, initOffset, c, cOffset);
        }
    }

    /** Column groups of a gradient pass: how many vector panels of A are packed at once. */
    static final int GROUP = 4;

    /** Rows of A a forward pass packs at once (a multiple of the register block's 6 rows). */
    static final int ROW_BLOCK = 48;

    /**
     * @return the length of the {@code pack} buffer that {@link #multiplyByTransposed} and
     *     {@link #addTransposedProduct} need for up to {@code rows} rows, {@code outputs} = m and {@code inputs} = k
     */
    public static int packLength(int rows, int outputs, int inputs) {
        if (!VECTOR) {
            return 1;
        }
        long width = 2L * VectorKernels.lanes();
        long panels = (outputs + width - 1) / width;
        long six = VectorKernels.ROWS;
        long packedRows = (Math.min(rows, ROW_BLOCK) + six - 1) / six * six;
        long forward = panels * width * inputs + panels * width + six * width + packedRows * inputs;
        long gradient = (outputs + six - 1) / six * six * rows + GROUP * width * rows + six * width;
        long narrow = width * inputs + width + 4 * width;
        return Math.toIntExact(Math.max(Math.max(forward, gradient), narrow));
    }

    /**
     * C (n × m) = init + A (n × k) · Wᵀ with W (m × k) row-major (a layer's weights): the same chains as
     * {@link #product} with B = Wᵀ. The vector path packs W into column panels in {@code pack} first; outputs
     * narrower than one register block (e.g. a layer of 10 classes) go through one zero-padded panel, with A read
     * in place.
     *
     * @param w W, row j at {@code wOffset + j·k}; not modified
     * @param pack scratch of at least {@link #packLength} values; modified
     */
    public static void multiplyByTransposed(double[] a, int aOffset, int n, int k, double[] w, int wOffset, int m,
            double[] init, int initOffset, double[] c, int cOffset, double[] pack) {
        if (VECTOR && n >= 4 && m >= VECTOR_COLUMNS) {
            VectorKernels.multiplyByTransposed(a, aOffset, n, k, w, wOffset, m, init, initOffset, c, cOffset, pack);
        } else if (VECTOR && n >= VECTOR_COLUMNS) {
            VectorKernels.narrowByTransposed(a, aOffset, n, k, w, wOffset, m, init, initOffset, c, cOffset, pack);
        } else {
            productTransposed(a, aOffset, n, k, w, wOffset, m, init, initOffset, c, cOffset);
        }
    }

    /**
     * G (m × k) += Dᵀ (m × n) · A (n × k) with D (n × m): {@code g[j][i] = fma(d[n−1][j], a[n−1][i], …
     * fma(d[0][j], a[0][i], g[j][i]))}, r ascending.
     *
     * @param d D, row r at {@code dOffset + r·m}; not modified
     * @param a A, row r at {@code aOffset + r·k}; not modified
     * @param g G, row j at {@code gOffset + j·k}; modified (added to), must not overlap D or A
     * @param pack scratch of at least {@link #packLength} values; modified
     */
    public static void addTransposedProduct(double[] d, int dOffset, int n, int m, double[] a, int aOffset, int k,
            double[] g, int gOffset, double[] pack) {
        if (VECTOR && k >= VECTOR_COLUMNS) {
            VectorKernels.addTransposedProduct(d, dOffset, n, m, a, aOffset, k, g, gOffset, pack);
        } else {
            scalarAddTransposedProduct(d, dOffset, n, m, a, aOffset, k, g, gOffset);
        }
    }

    /**
     * C (n × m) = init + A (n × k) · Wᵀ with W (m × k) row-major, for few rows: each output is the same chain
     * as {@link #product} with B = Wᵀ, computed without transposing W.
     *
     * @param w W, row j at {@code wOffset + j·k}; not modified
     */
    public static void productTransposed(double[] a, int aOffset, int n, int k, double[] w, int wOffset, int m,
            double[] init, int initOffset, double[] c, int cOffset) {
        for (int r = 0; r < n; r++) {
            int ar = aOffset + r * k;
            int cr = cOffset + r * m;
            int j = 0;
            for (; j + 4 <= m; j += 4) {
                int w0 = wOffset + j * k;
                int w1 = w0 + k;
                int w2 = w1 + k;
                int w3 = w2 + k;
                double c0 = init == null ? 0.0 : init[initOffset + j];
                double c1 = init == null ? 0.0 : init[initOffset + j + 1];
                double c2 = init == null ? 0.0 : init[initOffset + j + 2];
                double c3 = init == null ? 0.0 : init[initOffset + j + 3];
                for (int i = 0; i < k; i++) {
                    double x = a[ar + i];
                    c0 = Math.fma(x, w[w0 + i], c0);
                    c1 = Math.fma(x, w[w1 + i], c1);
                    c2 = Math.fma(x, w[w2 + i], c2);
                    c3 = Math.fma(x, w[w3 + i], c3);
                }
                c[cr + j] = c0;
                c[cr + j + 1] = c1;
                c[cr + j + 2] = c2;
                c[cr + j + 3] = c3;
            }
            for (; j < m; j++) {
                int wj = wOffset + j * k;
                double acc = init == null ? 0.0 : init[initOffset + j];
                for (int i = 0; i < k; i++) {
                    acc = Math.fma(a[ar + i], w[wj + i], acc);
                }
                c[cr + j] = acc;
            }
        }
    }

    /** The scalar path of {@link #product}: same chains, axpy order (row by row, i outer, j inner). */
    static void scalarProduct(double[] a, int aOffset, int n, int k, double[] b, int bOffset, int m,
            double[] init, int initOffset, double[] c, int cOffset) {
        for (int r = 0; r < n; r++) {
            int cr = cOffset + r * m;
            if (init == null) {
                java.util.Arrays.fill(c, cr, cr + m, 0.0);
            } else {
                System.arraycopy(init, initOffset, c, cr, m);
            }
            int ar = aOffset + r * k;
            for (int i = 0; i < k; i++) {
                double x = a[ar + i];
                int bi = bOffset + i * m;
                for (int j = 0; j < m; j++) {
                    c[cr + j] = Math.fma(x, b[bi + j], c[cr + j]);
                }
            }
        }
    }

    /** The scalar path of {@link #addTransposedProduct}: same chains, r outer. */
    static void scalarAddTransposedProduct(double[] d, int dOffset, int n, int m, double[] a, int aOffset, int k,
            double[] g, int gOffset) {
        for (int r = 0; r < n; r++) {
            int ar = aOffset + r * k;
            int dr = dOffset + r * m;
            for (int j = 0; j < m; j++) {
                double dj = d[dr + j];
                int gj = gOffset + j * k;
                for (int i = 0; i < k; i++) {
                    g[gj + i] = Math.fma(dj, a[ar + i], g[gj + i]);
                }
            }
        }
    }

    /**
     * ReLU in place: v ← max(v, 0) as {@link Math#max} defines it (−0 and +0 give +0, NaN stays NaN).
     *
     * @param v modified, the first {@code count} values
     * @param width the layer's width (rows of count / width values); narrow layers run scalar
     */
    public static void relu(double[] v, int count, int width) {
        int i = 0;
        if (VECTOR && width >= VECTOR_COLUMNS) {
            i = VectorKernels.relu(v, count);
        }
        for (; i < count; i++) {
            v[i] = Math.max(v[i], 0.0);
        }
    }

    /**
     * The ReLU derivative's mask: d ← 0 wherever a is not positive, d unchanged elsewhere.
     *
     * @param d modified, the first {@code count} values
     * @param a the layer's outputs; not modified
     * @param width the layer's width (rows of count / width values); narrow layers run scalar
     */
    public static void keepWherePositive(double[] d, double[] a, int count, int width) {
        int i = 0;
        if (VECTOR && width >= VECTOR_COLUMNS) {
            i = VectorKernels.keepWherePositive(d, a, count);
        }
        for (; i < count; i++) {
            if (!(a[i] > 0)) {
                d[i] = 0.0;
            }
        }
    }

    // exp: fdlibm's reduction constants (e_exp.c, as in java.lang.StrictMath), checked against ln 2 to 1e-26
    static final double LOG2E = 1.44269504088896338700e+00;
    static final double LN2_HI = 6.93147180369123816490e-01;
    static final double LN2_LO = 1.90821492927058770002e-10;
    /** 1.5 · 2^52: adding it rounds to an integer held in the low bits of the sum's representation. */
    static final double SHIFTER = 0x1.8p52;
    static final long SHIFTER_BITS = 0x4338000000000000L;
    /** x is clamped to [EXP_LOW, EXP_HIGH] first: e^−746 is under 2^−1075 and rounds to 0, e^710 overflows to +∞. */
    static final double EXP_LOW = -746.0;
    static final double EXP_HIGH = 710.0;
    // 1/j!, j = 2 … 14: the Taylor polynomial of exp on |r| ≤ ln 2 / 2, truncation error below 5e-18 (relative)
    static final double C2 = 1.0 / 2;
    static final double C3 = 1.0 / 6;
    static final double C4 = 1.0 / 24;
    static final double C5 = 1.0 / 120;
    static final double C6 = 1.0 / 720;
    static final double C7 = 1.0 / 5040;
    static final double C8 = 1.0 / 40320;
    static final double C9 = 1.0 / 362880;
    static final double C10 = 1.0 / 3628800;
    static final double C11 = 1.0 / 39916800;
    static final double C12 = 1.0 / 479001600;
    static final double C13 = 1.0 / 6227020800.0;
    static final double C14 = 1.0 / 87178291200.0;

    /**
     * e^x within about one ulp, as a fixed sequence of IEEE operations that the vector path repeats lane by lane,
     * so {@link #exp(double[], int, int, double[])} gives the same bits on either path. x = n·ln 2 + r with n the integer
     * nearest x·log2 e (|r| ≤ ln 2 / 2, r from two fused multiply-adds with ln 2 split in two), e^r by its
     * degree-14 Taylor polynomial in Horner form, then e^r · 2^h · 2^(n−h) with h = ⌊n/2⌋: both factors are normal
     * numbers for every n in range, so the only rounding of the scaling is the last one, into the subnormals if
     * the result is that small. x is first clamped to [−746, 710], which gives 0 below (the true value rounds to
     * 0) and +∞ above, without a branch; NaN stays NaN.
     */
    public static double exp(double value) {
        double x = Math.min(Math.max(value, EXP_LOW), EXP_HIGH);
        double t = Math.fma(x, LOG2E, SHIFTER);
        double n = t - SHIFTER;
        double r = Math.fma(-n, LN2_HI, x);
        r = Math.fma(-n, LN2_LO, r);
        double p = Math.fma(C14, r, C13);
        p = Math.fma(p, r, C12);
        p = Math.fma(p, r, C11);
        p = Math.fma(p, r, C10);
        p = Math.fma(p, r, C9);
        p = Math.fma(p, r, C8);
        p = Math.fma(p, r, C7);
        p = Math.fma(p, r, C6);
        p = Math.fma(p, r, C5);
        p = Math.fma(p, r, C4);
        p = Math.fma(p, r, C3);
        p = Math.fma(p, r, C2);
        p = Math.fma(p, r, 1.0);
        p = Math.fma(p, r, 1.0);
        return scale(p, t);
    }

    /**
     * @return p · 2^n, n the integer held in the low bits of t = fma(x, log2 e, 1.5 · 2^52), in two normal factors
     *     2^h · 2^(n−h), h = ⌊n/2⌋, so that only the last multiplication rounds
     */
    static double scale(double p, double t) {
        long whole = Double.doubleToRawLongBits(t) - SHIFTER_BITS;
        long half = whole >> 1;
        return p * Double.longBitsToDouble((half + 1023) << 52) * Double.longBitsToDouble((whole - half + 1023) << 52);
    }

    /**
     * v ← e^v in place for {@code count} values from {@code offset}, each by {@link #exp(double)}, the same bits on
     * either path. The vector path computes the polynomial p in whole vectors and keeps t (the reduction's
     * shifted n) in {@code scratch}; the scaling p · 2^n, integer work on t's bits, then runs scalar: vector code
     * for it (long lanes reinterpreted from double lanes) was compiled in some JVM runs into code that boxed a
     * vector on every iteration.
     *
     * @param scratch at least {@code count} values; modified
     */
    public static void exp(double[] v, int offset, int count, double[] scratch) {
        int i = 0;
        if (VECTOR) {
            i = VectorKernels.expPolynomial(v, offset, count, scratch);
            for (int j = 0; j < i; j++) {
                v[offset + j] = scale(v[offset + j], scratch[j]);
            }
        }
        for (; i < count; i++) {
            v[offset + i] = exp(v[offset + i]);
        }
    }

    /**
     * Adds the column sums of D (n × m) into {@code sums[offset .. offset + m)}, r ascending per column.
     *
     * @param d not modified
     * @param sums modified (added to)
     */
    public static void addColumnSums(double[] d, int n, int m, double[] sums, int offset) {
        for (int r = 0; r < n; r++) {
            int dr = r * m;
            for (int j = 0; j < m; j++) {
                sums[offset + j] += d[dr + j];
            }
        }
    }
}
