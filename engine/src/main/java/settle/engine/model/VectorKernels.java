package settle.engine.model;

import jdk.incubator.vector.DoubleVector;
import jdk.incubator.vector.VectorOperators;
import jdk.incubator.vector.VectorSpecies;

/**
 * The vector path of {@link Kernels}: register blocks of 4 rows × 2 vectors of independent outputs, each lane
 * one output's fused multiply-add chain in the summed index's ascending order (see {@link Kernels} for the
 * contract). Loaded only when {@code jdk.incubator.vector} is in the boot layer.
 */
final class VectorKernels {

    private static final VectorSpecies<Double> S = DoubleVector.SPECIES_PREFERRED;
    private static final int L = S.length();

    private VectorKernels() {
    }

    /** @return true when the preferred species has at least 2 lanes */
    static boolean usable() {
        return L >= 2;
    }

    /** @return doubles per vector */
    static int lanes() {
        return L;
    }

    /** @return how many leading values of v were set to max(v, 0) (whole vectors); see {@link Kernels#relu} */
    static int relu(double[] v, int count) {
        int i = 0;
        for (; i + L <= count; i += L) {
            DoubleVector.fromArray(S, v, i).max(0.0).intoArray(v, i);
        }
        return i;
    }

    /** @return how many leading values were masked (whole vectors); see {@link Kernels#keepWherePositive} */
    static int keepWherePositive(double[] d, double[] a, int count) {
        int i = 0;
        DoubleVector zero = DoubleVector.zero(S);
        for (; i + L <= count; i += L) {
            DoubleVector x = DoubleVector.fromArray(S, a, i);
            DoubleVector.fromArray(S, d, i).blend(zero, x.compare(VectorOperators.GT, 0.0).not()).intoArray(d, i);
        }
        return i;
    }

    /** See {@link Kernels#product}: lanes run over the m columns of B and C. */
    static void product(double[] a, int aOffset, int n, int k, double[] b, int bOffset, int m,
            double[] init, int initOffset, double[] c, int cOffset) {
        int j = 0;
        for (; j + 2 * L <= m; j += 2 * L) {
            int r = 0;
            for (; r + 4 <= n; r += 4) {
                product4x2(a, aOffset + r * k, k, b, bOffset + j, m, init, initOffset + j, c, cOffset + r * m + j, m);
            }
            for (; r < n; r++) {
                product1x2(a, aOffset + r * k, k, b, bOffset + j, m, init, initOffset + j, c, cOffset + r * m + j);
            }
        }
        for (; j + L <= m; j += L) {
            for (int r = 0; r < n; r++) {
                product1x1(a, aOffset + r * k, k, b, bOffset + j, m, init, initOffset + j, c, cOffset + r * m + j);
            }
        }
        for (; j < m; j++) {
            for (int r = 0; r < n; r++) {
                int ar = aOffset + r * k;
                double acc = init == null ? 0.0 : init[initOffset + j];
                int bi = bOffset + j;
                for (int i = 0; i < k; i++, bi += m) {
                    acc = Math.fma(a[ar + i], b[bi], acc);
                }
                c[cOffset + r * m + j] = acc;
            }
        }
    }

    /**
     * See {@link Kernels#multiplyByTransposed}: W's rows are packed into panels of 2L columns of Wᵀ (panel p holds
     * Wᵀ[i][2Lp .. 2Lp + 2L) for i = 0 … k−1, contiguous), then multiplied like {@link #product}; the last
     * m mod 2L columns go through a zero-padded panel and a tile.
     */
    static void multiplyByTransposed(double[] a, int aOffset, int n, int k, double[] w, int wOffset, int m,
            double[] init, int initOffset, double[] c, int cOffset, double[] pack) {
        int width = 2 * L;
        int panels = m / width;
        int rest = m - panels * width;
        int all = panels + (rest > 0 ? 1 : 0);
        for (int p = 0; p < all; p++) {
            int base = p * k * width;
            int valid = p < panels ? width : rest;
            int row = wOffset + p * width * k;
            for (int i = 0; i < k; i++) {
                int to = base + i * width;
                for (int jj = 0; jj < valid; jj++) {
                    pack[to + jj] = w[row + jj * k + i];
                }
                for (int jj = valid; jj < width; jj++) {
                    pack[to + jj] = 0.0;
                }
            }
        }
        for (int p = 0; p < panels; p++) {
            int j = p * width;
            int base = p * k * width;
            int r = 0;
            for (; r + 6 <= n; r += 6) {
                product6x2(a, aOffset + r * k, k, pack, base, width, init, initOffset + j, c, cOffset + r * m + j, m);
            }
            for (; r + 4 <= n; r += 4) {
                product4x2(a, aOffset + r * k, k, pack, base, width, init, initOffset + j, c, cOffset + r * m + j, m);
            }
            for (; r < n; r++) {
                product1x2(a, aOffset + r * k, k, pack, base, width, init, initOffset + j, c, cOffset + r * m + j);
            }
        }
        if (rest > 0) {
            // the last, partial panel: zero-padded weights and starting values, results through a tile in pack
            int j = panels * width;
            int base = panels * k * width;
            int padded = all * k * width;
            int tile = padded + width;
            double[] start = null;
            if (init != null) {
                start = pack;
                for (int jj = 0; jj < width; jj++) {
                    pack[padded + jj] = jj < rest ? init[initOffset + j + jj] : 0.0;
                }
            }
            int r = 0;
            for (; r + 6 <= n; r += 6) {
                product6x2(a, aOffset + r * k, k, pack, base, width, start, padded, pack, tile, width);
                untile(pack, tile, 6, width, rest, c, cOffset + r * m + j, m);
            }
            for (; r + 4 <= n; r += 4) {
                product4x2(a, aOffset + r * k, k, pack, base, width, start, padded, pack, tile, width);
                untile(pack, tile, 4, width, rest, c, cOffset + r * m + j, m);
            }
            for (; r < n; r++) {
                product1x2(a, aOffset + r * k, k, pack, base, width, start, padded, pack, tile);
                untile(pack, tile, 1, width, rest, c, cOffset + r * m + j, m);
            }
        }
    }

    /** Copies the first {@code valid} columns of a rows × width tile into C. */
    private static void untile(double[] tile, int t0, int rows, int width, int valid, double[] c, int c0, int cStride) {
        for (int q = 0; q < rows; q++) {
            System.arraycopy(tile, t0 + q * width, c, c0 + q * cStride, valid);
        }
    }

    private static DoubleVector start(double[] init, int offset) {
        return init == null ? DoubleVector.zero(S) : DoubleVector.fromArray(S, init, offset);
    }

    /** 4 rows × 2L columns; B rows {@code bStride} apart, C rows {@code cStride} apart. */
    private static void product4x2(double[] a, int a0, int k, double[] b, int b0, int bStride, double[] init, int i0,
            double[] c, int c0, int cStride) {
        DoubleVector s0 = start(init, i0);
        DoubleVector s1 = start(init, i0 + L);
        DoubleVector c00 = s0;
        DoubleVector c01 = s1;
        DoubleVector c10 = s0;
        DoubleVector c11 = s1;
        DoubleVector c20 = s0;
        DoubleVector c21 = s1;
        DoubleVector c30 = s0;
        DoubleVector c31 = s1;
        int a1 = a0 + k;
        int a2 = a1 + k;
        int a3 = a2 + k;
        for (int i = 0; i < k; i++) {
            int bi = b0 + i * bStride;
            DoubleVector v0 = DoubleVector.fromArray(S, b, bi);
            DoubleVector v1 = DoubleVector.fromArray(S, b, bi + L);
            DoubleVector x0 = DoubleVector.broadcast(S, a[a0 + i]);
            c00 = x0.fma(v0, c00);
            c01 = x0.fma(v1, c01);
            DoubleVector x1 = DoubleVector.broadcast(S, a[a1 + i]);
            c10 = x1.fma(v0, c10);
            c11 = x1.fma(v1, c11);
            DoubleVector x2 = DoubleVector.broadcast(S, a[a2 + i]);
            c20 = x2.fma(v0, c20);
            c21 = x2.fma(v1, c21);
            DoubleVector x3 = DoubleVector.broadcast(S, a[a3 + i]);
            c30 = x3.fma(v0, c30);
            c31 = x3.fma(v1, c31);
        }
        c00.intoArray(c, c0);
        c01.intoArray(c, c0 + L);
        c10.intoArray(c, c0 + cStride);
        c11.intoArray(c, c0 + cStride + L);
        c20.intoArray(c, c0 + 2 * cStride);
        c21.intoArray(c, c0 + 2 * cStride + L);
        c30.intoArray(c, c0 + 3 * cStride);
        c31.intoArray(c, c0 + 3 * cStride + L);
    }

    /** 6 rows × 2L columns, twelve accumulators; B rows {@code bStride} apart, C rows {@code cStride} apart. */
    private static void product6x2(double[] a, int a0, int k, double[] b, int b0, int bStride, double[] init, int i0,
            double[] c, int c0, int cStride) {
        DoubleVector s0 = start(init, i0);
        DoubleVector s1 = start(init, i0 + L);
        DoubleVector c00 = s0;
        DoubleVector c01 = s1;
        DoubleVector c10 = s0;
        DoubleVector c11 = s1;
        DoubleVector c20 = s0;
        DoubleVector c21 = s1;
        DoubleVector c30 = s0;
        DoubleVector c31 = s1;
        DoubleVector c40 = s0;
        DoubleVector c41 = s1;
        DoubleVector c50 = s0;
        DoubleVector c51 = s1;
        int a1 = a0 + k;
        int a2 = a1 + k;
        int a3 = a2 + k;
        int a4 = a3 + k;
        int a5 = a4 + k;
        for (int i = 0; i < k; i++) {
            int bi = b0 + i * bStride;
            DoubleVector v0 = DoubleVector.fromArray(S, b, bi);
            DoubleVector v1 = DoubleVector.fromArray(S, b, bi + L);
            DoubleVector x0 = DoubleVector.broadcast(S, a[a0 + i]);
            c00 = x0.fma(v0, c00);
            c01 = x0.fma(v1, c01);
            DoubleVector x1 = DoubleVector.broadcast(S, a[a1 + i]);
            c10 = x1.fma(v0, c10);
            c11 = x1.fma(v1, c11);
            DoubleVector x2 = DoubleVector.broadcast(S, a[a2 + i]);
            c20 = x2.fma(v0, c20);
            c21 = x2.fma(v1, c21);
            DoubleVector x3 = DoubleVector.broadcast(S, a[a3 + i]);
            c30 = x3.fma(v0, c30);
            c31 = x3.fma(v1, c31);
            DoubleVector x4 = DoubleVector.broadcast(S, a[a4 + i]);
            c40 = x4.fma(v0, c40);
            c41 = x4.fma(v1, c41);
            DoubleVector x5 = DoubleVector.broadcast(S, a[a5 + i]);
            c50 = x5.fma(v0, c50);
            c51 = x5.fma(v1, c51);
        }
        c00.intoArray(c, c0);
        c01.intoArray(c, c0 + L);
        c10.intoArray(c, c0 + cStride);
        c11.intoArray(c, c0 + cStride + L);
        c20.intoArray(c, c0 + 2 * cStride);
        c21.intoArray(c, c0 + 2 * cStride + L);
        c30.intoArray(c, c0 + 3 * cStride);
        c31.intoArray(c, c0 + 3 * cStride + L);
        c40.intoArray(c, c0 + 4 * cStride);
        c41.intoArray(c, c0 + 4 * cStride + L);
        c50.intoArray(c, c0 + 5 * cStride);
        c51.intoArray(c, c0 + 5 * cStride + L);
    }

    private static void product1x2(double[] a, int a0, int k, double[] b, int b0, int bStride, double[] init, int i0,
            double[] c, int c0) {
        DoubleVector c00 = start(init, i0);
        DoubleVector c01 = start(init, i0 + L);
        int bi = b0;
        for (int i = 0; i < k; i++, bi += bStride) {
            DoubleVector x0 = DoubleVector.broadcast(S, a[a0 + i]);
            c00 = x0.fma(DoubleVector.fromArray(S, b, bi), c00);
            c01 = x0.fma(DoubleVector.fromArray(S, b, bi + L), c01);
        }
        c00.intoArray(c, c0);
        c01.intoArray(c, c0 + L);
    }

    private static void product1x1(double[] a, int a0, int k, double[] b, int b0, int m, double[] init, int i0,
            double[] c, int c0) {
        DoubleVector c00 = start(init, i0);
        int bi = b0;
        for (int i = 0; i < k; i++, bi += m) {
            c00 = DoubleVector.broadcast(S, a[a0 + i]).fma(DoubleVector.fromArray(S, b, bi), c00);
        }
        c00.intoArray(c, c0);
    }

    /**
     * See {@link Kernels#addTransposedProduct}: lanes run over the k columns of A and G. D is transposed into
     * {@code pack} (Dᵀ, m × n) and A's columns are packed {@link Kernels#GROUP} panels of 2L at a time (panel q
     * holds A[r][..] for r = 0 … n−1, contiguous), so that every block of 4 rows of G reuses a packed group from
     * cache; the last k mod 2L columns go through a zero-padded panel and a tile.
     */
    static void addTransposedProduct(double[] d, int dOffset, int n, int m, double[] a, int aOffset, int k,
            double[] g, int gOffset, double[] pack) {
        int width = 2 * L;
        int full = k / width * width;
        for (int r = 0; r < n; r++) {
            int dr = dOffset + r * m;
            for (int j = 0; j < m; j++) {
                pack[j * n + r] = d[dr + j];
            }
        }
        int packA = m * n;
        for (int g0 = 0; g0 < full; g0 += Kernels.GROUP * width) {
            int g1 = Math.min(full, g0 + Kernels.GROUP * width);
            for (int i0 = g0; i0 < g1; i0 += width) {
                int base = packA + (i0 - g0) * n;
                for (int r = 0; r < n; r++) {
                    System.arraycopy(a, aOffset + r * k + i0, pack, base + r * width, width);
                }
            }
            int j = 0;
            for (; j + 6 <= m; j += 6) {
                for (int i0 = g0; i0 < g1; i0 += width) {
                    gradient6x2(pack, j * n, n, pack, packA + (i0 - g0) * n, g, gOffset + j * k + i0, k);
                }
            }
            for (; j + 4 <= m; j += 4) {
                for (int i0 = g0; i0 < g1; i0 += width) {
                    gradient4x2(pack, j * n, n, pack, packA + (i0 - g0) * n, g, gOffset + j * k + i0, k);
                }
            }
            for (; j < m; j++) {
                for (int i0 = g0; i0 < g1; i0 += width) {
                    gradient1x2(pack, j * n, n, pack, packA + (i0 - g0) * n, g, gOffset + j * k + i0);
                }
            }
        }
        int rest = k - full;
        if (rest > 0) {
            // the last, partial panel of A, zero-padded; each block of G goes through a tile in pack
            for (int r = 0; r < n; r++) {
                int to = packA + r * width;
                System.arraycopy(a, aOffset + r * k + full, pack, to, rest);
                for (int ii = rest; ii < width; ii++) {
                    pack[to + ii] = 0.0;
                }
            }
            int tile = packA + n * width;
            int j = 0;
            for (; j + 6 <= m; j += 6) {
                toTile(g, gOffset + j * k + full, k, 6, rest, pack, tile, width);
                gradient6x2(pack, j * n, n, pack, packA, pack, tile, width);
                untile(pack, tile, 6, width, rest, g, gOffset + j * k + full, k);
            }
            for (; j + 4 <= m; j += 4) {
                toTile(g, gOffset + j * k + full, k, 4, rest, pack, tile, width);
                gradient4x2(pack, j * n, n, pack, packA, pack, tile, width);
                untile(pack, tile, 4, width, rest, g, gOffset + j * k + full, k);
            }
            for (; j < m; j++) {
                toTile(g, gOffset + j * k + full, k, 1, rest, pack, tile, width);
                gradient1x2(pack, j * n, n, pack, packA, pack, tile);
                untile(pack, tile, 1, width, rest, g, gOffset + j * k + full, k);
            }
        }
    }

    /** Copies {@code valid} columns of {@code rows} rows of G into a zero-padded rows × width tile. */
    private static void toTile(double[] g, int g0, int gStride, int rows, int valid, double[] tile, int t0, int width) {
        for (int q = 0; q < rows; q++) {
            System.arraycopy(g, g0 + q * gStride, tile, t0 + q * width, valid);
            for (int ii = valid; ii < width; ii++) {
                tile[t0 + q * width + ii] = 0.0;
            }
        }
    }

    /** G rows j … j+3 (k apart from g0) += over r of Dᵀ rows (n apart from d0) times the packed panel at p0. */
    private static void gradient4x2(double[] dt, int d0, int n, double[] pack, int p0, double[] g, int g0, int k) {
        DoubleVector g00 = DoubleVector.fromArray(S, g, g0);
        DoubleVector g01 = DoubleVector.fromArray(S, g, g0 + L);
        DoubleVector g10 = DoubleVector.fromArray(S, g, g0 + k);
        DoubleVector g11 = DoubleVector.fromArray(S, g, g0 + k + L);
        DoubleVector g20 = DoubleVector.fromArray(S, g, g0 + 2 * k);
        DoubleVector g21 = DoubleVector.fromArray(S, g, g0 + 2 * k + L);
        DoubleVector g30 = DoubleVector.fromArray(S, g, g0 + 3 * k);
        DoubleVector g31 = DoubleVector.fromArray(S, g, g0 + 3 * k + L);
        int d1 = d0 + n;
        int d2 = d1 + n;
        int d3 = d2 + n;
        int ap = p0;
        for (int r = 0; r < n; r++, ap += 2 * L) {
            DoubleVector v0 = DoubleVector.fromArray(S, pack, ap);
            DoubleVector v1 = DoubleVector.fromArray(S, pack, ap + L);
            DoubleVector x0 = DoubleVector.broadcast(S, dt[d0 + r]);
            g00 = x0.fma(v0, g00);
            g01 = x0.fma(v1, g01);
            DoubleVector x1 = DoubleVector.broadcast(S, dt[d1 + r]);
            g10 = x1.fma(v0, g10);
            g11 = x1.fma(v1, g11);
            DoubleVector x2 = DoubleVector.broadcast(S, dt[d2 + r]);
            g20 = x2.fma(v0, g20);
            g21 = x2.fma(v1, g21);
            DoubleVector x3 = DoubleVector.broadcast(S, dt[d3 + r]);
            g30 = x3.fma(v0, g30);
            g31 = x3.fma(v1, g31);
        }
        g00.intoArray(g, g0);
        g01.intoArray(g, g0 + L);
        g10.intoArray(g, g0 + k);
        g11.intoArray(g, g0 + k + L);
        g20.intoArray(g, g0 + 2 * k);
        g21.intoArray(g, g0 + 2 * k + L);
        g30.intoArray(g, g0 + 3 * k);
        g31.intoArray(g, g0 + 3 * k + L);
    }

    /** G rows j … j+5 (k apart from g0) += over r of Dᵀ rows (n apart from d0) times the packed panel at p0. */
    private static void gradient6x2(double[] dt, int d0, int n, double[] pack, int p0, double[] g, int g0, int k) {
        DoubleVector g00 = DoubleVector.fromArray(S, g, g0);
        DoubleVector g01 = DoubleVector.fromArray(S, g, g0 + L);
        DoubleVector g10 = DoubleVector.fromArray(S, g, g0 + k);
        DoubleVector g11 = DoubleVector.fromArray(S, g, g0 + k + L);
        DoubleVector g20 = DoubleVector.fromArray(S, g, g0 + 2 * k);
        DoubleVector g21 = DoubleVector.fromArray(S, g, g0 + 2 * k + L);
        DoubleVector g30 = DoubleVector.fromArray(S, g, g0 + 3 * k);
        DoubleVector g31 = DoubleVector.fromArray(S, g, g0 + 3 * k + L);
        DoubleVector g40 = DoubleVector.fromArray(S, g, g0 + 4 * k);
        DoubleVector g41 = DoubleVector.fromArray(S, g, g0 + 4 * k + L);
        DoubleVector g50 = DoubleVector.fromArray(S, g, g0 + 5 * k);
        DoubleVector g51 = DoubleVector.fromArray(S, g, g0 + 5 * k + L);
        int d1 = d0 + n;
        int d2 = d1 + n;
        int d3 = d2 + n;
        int d4 = d3 + n;
        int d5 = d4 + n;
        int ap = p0;
        for (int r = 0; r < n; r++, ap += 2 * L) {
            DoubleVector v0 = DoubleVector.fromArray(S, pack, ap);
            DoubleVector v1 = DoubleVector.fromArray(S, pack, ap + L);
            DoubleVector x0 = DoubleVector.broadcast(S, dt[d0 + r]);
            g00 = x0.fma(v0, g00);
            g01 = x0.fma(v1, g01);
            DoubleVector x1 = DoubleVector.broadcast(S, dt[d1 + r]);
            g10 = x1.fma(v0, g10);
            g11 = x1.fma(v1, g11);
            DoubleVector x2 = DoubleVector.broadcast(S, dt[d2 + r]);
            g20 = x2.fma(v0, g20);
            g21 = x2.fma(v1, g21);
            DoubleVector x3 = DoubleVector.broadcast(S, dt[d3 + r]);
            g30 = x3.fma(v0, g30);
            g31 = x3.fma(v1, g31);
            DoubleVector x4 = DoubleVector.broadcast(S, dt[d4 + r]);
            g40 = x4.fma(v0, g40);
            g41 = x4.fma(v1, g41);
            DoubleVector x5 = DoubleVector.broadcast(S, dt[d5 + r]);
            g50 = x5.fma(v0, g50);
            g51 = x5.fma(v1, g51);
        }
        g00.intoArray(g, g0);
        g01.intoArray(g, g0 + L);
        g10.intoArray(g, g0 + k);
        g11.intoArray(g, g0 + k + L);
        g20.intoArray(g, g0 + 2 * k);
        g21.intoArray(g, g0 + 2 * k + L);
        g30.intoArray(g, g0 + 3 * k);
        g31.intoArray(g, g0 + 3 * k + L);
        g40.intoArray(g, g0 + 4 * k);
        g41.intoArray(g, g0 + 4 * k + L);
        g50.intoArray(g, g0 + 5 * k);
        g51.intoArray(g, g0 + 5 * k + L);
    }

    private static void gradient1x2(double[] dt, int d0, int n, double[] pack, int p0, double[] g, int g0) {
        DoubleVector g00 = DoubleVector.fromArray(S, g, g0);
        DoubleVector g01 = DoubleVector.fromArray(S, g, g0 + L);
        int ap = p0;
        for (int r = 0; r < n; r++, ap += 2 * L) {
            DoubleVector x0 = DoubleVector.broadcast(S, dt[d0 + r]);
            g00 = x0.fma(DoubleVector.fromArray(S, pack, ap), g00);
            g01 = x0.fma(DoubleVector.fromArray(S, pack, ap + L), g01);
        }
        g00.intoArray(g, g0);
        g01.intoArray(g, g0 + L);
    }
}
