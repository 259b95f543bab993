package settle.engine.model;

import jdk.incubator.vector.DoubleVector;
import jdk.incubator.vector.VectorOperators;
import jdk.incubator.vector.VectorSpecies;

/**
 * The vector path of {@link Kernels}: register blocks of rows × 2 vectors of independent outputs (6 rows over
 * packed operands, 4 or 1 in {@link #product}), each lane one output's fused multiply-add chain in the summed
 * index's ascending order (see {@link Kernels} for the contract). Loaded only when {@code jdk.incubator.vector}
 * is in the boot layer.
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

    /**
     * The vector part of {@link Kernels#exp(double[], int, int, double[])}: for whole vectors from {@code offset},
     * each lane the operations of {@link Kernels#exp(double)} in its order up to the scaling, p into v and t into
     * {@code scratch} from 0.
     *
     * @return how many leading values were done
     */
    static int expPolynomial(double[] v, int offset, int count, double[] scratch) {
        // clamping x gives 0 and +∞ at the ends without a blend (a blend here also boxed a vector per iteration in
        // some compiled contexts: KernelsAllocationTest); the constants are made inside the loop (hoisted)
        int i = 0;
        for (; i + L <= count; i += L) {
            DoubleVector shifter = DoubleVector.broadcast(S, Kernels.SHIFTER);
            DoubleVector one = DoubleVector.broadcast(S, 1.0);
            DoubleVector x = DoubleVector.fromArray(S, v, offset + i)
                    .max(DoubleVector.broadcast(S, Kernels.EXP_LOW))
                    .min(DoubleVector.broadcast(S, Kernels.EXP_HIGH));
            DoubleVector t = x.fma(DoubleVector.broadcast(S, Kernels.LOG2E), shifter);
            DoubleVector n = t.sub(shifter).neg();
            DoubleVector r = n.fma(DoubleVector.broadcast(S, Kernels.LN2_HI), x);
            r = n.fma(DoubleVector.broadcast(S, Kernels.LN2_LO), r);
            DoubleVector p = DoubleVector.broadcast(S, Kernels.C14).fma(r, DoubleVector.broadcast(S, Kernels.C13));
            p = p.fma(r, DoubleVector.broadcast(S, Kernels.C12));
            p = p.fma(r, DoubleVector.broadcast(S, Kernels.C11));
            p = p.fma(r, DoubleVector.broadcast(S, Kernels.C10));
            p = p.fma(r, DoubleVector.broadcast(S, Kernels.C9));
            p = p.fma(r, DoubleVector.broadcast(S, Kernels.C8));
            p = p.fma(r, DoubleVector.broadcast(S, Kernels.C7));
            p = p.fma(r, DoubleVector.broadcast(S, Kernels.C6));
            p = p.fma(r, DoubleVector.broadcast(S, Kernels.C5));
            p = p.fma(r, DoubleVector.broadcast(S, Kernels.C4));
            p = p.fma(r, DoubleVector.broadcast(S, Kernels.C3));
            p = p.fma(r, DoubleVector.broadcast(S, Kernels.C2));
            p = p.fma(r, one);
            p = p.fma(r, one);
            p.intoArray(v, offset + i);
            t.intoArray(scratch, i);
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
     * See {@link Kernels#multiplyByTransposed}. W's rows are packed into panels of 2L columns of Wᵀ (panel p holds
     * Wᵀ[i][2Lp .. 2Lp + 2L) for i = 0 … k−1, contiguous); A's rows are packed {@link Kernels#ROW_BLOCK} at a time
     * into micro-panels of {@link #ROWS} interleaved rows (micro-panel q holds A[6q + t][i] at 6i + t), so that the
     * register block reads both operands with one running index. C starts as the initial values and each block
     * of 6 rows × 2L columns runs its chains over all k in one pass. The last m mod 2L columns (a zero-padded
     * panel) and the last n mod 6 rows (a zero-padded micro-panel) go through a tile: padded lanes and rows are
     * outputs of their own that are never copied out, so they cannot touch a real output's chain.
     */
    static void multiplyByTransposed(double[] a, int aOffset, int n, int k, double[] w, int wOffset, int m,
            double[] init, int initOffset, double[] c, int cOffset, double[] pack) {
        int width = 2 * L;
        int panels = m / width;
        int rest = m - panels * width;
        int all = panels + (rest > 0 ? 1 : 0);
        for (int p = 0; p < all; p++) {
            int valid = p < panels ? width : rest;
            packPanel(w, wOffset + p * width * k, k, valid, pack, p * k * width, width);
        }
        // after the panels: the starting values of one tile row (m padded to all·2L), the tile, the packed rows
        int starts = all * k * width;
        int tile = starts + all * width;
        int packedA = tile + ROWS * width;
        for (int j = 0; j < all * width; j++) {
            pack[starts + j] = init != null && j < m ? init[initOffset + j] : 0.0;
        }
        int columns = panels * width;
        int whole = n / ROWS * ROWS;
        for (int r = 0; r < whole; r++) {
            System.arraycopy(pack, starts, c, cOffset + r * m, columns);
        }
        for (int r0 = 0; r0 < n; r0 += Kernels.ROW_BLOCK) {
            int r1 = Math.min(n, r0 + Kernels.ROW_BLOCK);
            int blocks = (r1 - r0 + ROWS - 1) / ROWS;
            for (int q = 0; q < blocks; q++) {
                int first = r0 + q * ROWS;
                packSix(a, aOffset + first * k, k, 1, k, Math.min(ROWS, n - first), pack, packedA + q * ROWS * k);
            }
            for (int p = 0; p < all; p++) {
                for (int q = 0; q < blocks; q++) {
                    int first = r0 + q * ROWS;
                    int rows = Math.min(ROWS, n - first);
                    int micro = packedA + q * ROWS * k;
                    if (p < panels && rows == ROWS) {
                        block6x2(pack, micro, k, pack, p * k * width, c, cOffset + first * m + p * width, m);
                    } else {
                        for (int t = 0; t < ROWS; t++) {
                            System.arraycopy(pack, starts + p * width, pack, tile + t * width, width);
                        }
                        block6x2(pack, micro, k, pack, p * k * width, pack, tile, width);
                        untile(pack, tile, rows, width, p < panels ? width : rest, c,
                                cOffset + first * m + p * width, m);
                    }
                }
            }
        }
    }

    /**
     * See {@link Kernels#multiplyByTransposed}, for outputs narrower than one register block (m < 2L): W is packed
     * into one zero-padded panel of 2L columns of Wᵀ, and blocks of 4 rows of A, read in place, run their chains
     * over all k through {@link #product}'s register blocks, into a tile whose first m columns are copied out. Padded lanes are outputs of their own that are never copied out. (Packing A, as the wide products do,
     * would cost as much as the multiply-adds here: there are only m of them per value of A.)
     */
    static void narrowByTransposed(double[] a, int aOffset, int n, int k, double[] w, int wOffset, int m,
            double[] init, int initOffset, double[] c, int cOffset, double[] pack) {
        int width = 2 * L;
        packPanel(w, wOffset, k, m, pack, 0, width);
        int starts = k * width;
        int tile = starts + width;
        for (int j = 0; j < width; j++) {
            pack[starts + j] = init != null && j < m ? init[initOffset + j] : 0.0;
        }
        // the panel is B = Wᵀ (k × 2L, rows 2L apart) of the plain product's register blocks
        int r = 0;
        for (; r + 4 <= n; r += 4) {
            product4x2(a, aOffset + r * k, k, pack, 0, width, pack, starts, pack, tile, width);
            for (int t = 0; t < 4; t++) {
                System.arraycopy(pack, tile + t * width, c, cOffset + (r + t) * m, m);
            }
        }
        for (; r < n; r++) {
            product1x2(a, aOffset + r * k, k, pack, 0, width, pack, starts, pack, tile);
            System.arraycopy(pack, tile, c, cOffset + r * m, m);
        }
    }

    /** Rows per register block of the packed products. */
    static final int ROWS = 6;

    /** Packs {@code valid} rows of W (k apart from w0) as columns of a k × width panel at p0, zero-padded. */
    private static void packPanel(double[] w, int w0, int k, int valid, double[] pack, int p0, int width) {
        for (int jj = 0; jj < valid; jj++) {
            int from = w0 + jj * k;
            int to = p0 + jj;
            for (int i = 0; i < k; i++) {
                pack[to + i * width] = w[from + i];
            }
        }
        for (int jj = valid; jj < width; jj++) {
            for (int i = 0; i < k; i++) {
                pack[p0 + jj + i * width] = 0.0;
            }
        }
    }

    /**
     * Packs {@code valid} ≤ 6 interleaved lines of {@code count} values into one micro-panel at p0, zero-padded
     * to 6 lines: value i of line t, {@code src[s0 + t·across + i·along]}, goes to p0 + 6i + t. Rows of A are
     * lines with across = k, along = 1; columns of D are lines with across = 1, along = m.
     */
    private static void packSix(double[] src, int s0, int across, int along, int count, int valid, double[] pack,
            int p0) {
        if (valid == ROWS) {
            for (int i = 0, from = s0, to = p0; i < count; i++, from += along, to += ROWS) {
                pack[to] = src[from];
                pack[to + 1] = src[from + across];
                pack[to + 2] = src[from + 2 * across];
                pack[to + 3] = src[from + 3 * across];
                pack[to + 4] = src[from + 4 * across];
                pack[to + 5] = src[from + 5 * across];
            }
            return;
        }
        for (int i = 0, from = s0, to = p0; i < count; i++, from += along, to += ROWS) {
            for (int t = 0; t < ROWS; t++) {
                pack[to + t] = t < valid ? src[from + t * across] : 0.0;
            }
        }
    }

    /**
     * The register block of the packed products: C (6 rows {@code cStride} apart from c0, 2L columns) gets, per
     * output, the chain continued over i = 0 … count−1 of fma(x[6i + t], y[2L·i + lane], ·), x a micro-panel of 6
     * interleaved rows at x0 and y a panel of 2L columns at y0. Both are read through the one loop index, which
     * lets the compiler drop the bounds checks and keep the loop to loads, broadcasts and fused multiply-adds.
     */
    private static void block6x2(double[] x, int x0, int count, double[] y, int y0, double[] c, int c0, int cStride) {
        DoubleVector c00 = DoubleVector.fromArray(S, c, c0);
        DoubleVector c01 = DoubleVector.fromArray(S, c, c0 + L);
        DoubleVector c10 = DoubleVector.fromArray(S, c, c0 + cStride);
        DoubleVector c11 = DoubleVector.fromArray(S, c, c0 + cStride + L);
        DoubleVector c20 = DoubleVector.fromArray(S, c, c0 + 2 * cStride);
        DoubleVector c21 = DoubleVector.fromArray(S, c, c0 + 2 * cStride + L);
        DoubleVector c30 = DoubleVector.fromArray(S, c, c0 + 3 * cStride);
        DoubleVector c31 = DoubleVector.fromArray(S, c, c0 + 3 * cStride + L);
        DoubleVector c40 = DoubleVector.fromArray(S, c, c0 + 4 * cStride);
        DoubleVector c41 = DoubleVector.fromArray(S, c, c0 + 4 * cStride + L);
        DoubleVector c50 = DoubleVector.fromArray(S, c, c0 + 5 * cStride);
        DoubleVector c51 = DoubleVector.fromArray(S, c, c0 + 5 * cStride + L);
        for (int i = 0; i < count; i++) {
            int xi = x0 + ROWS * i;
            int yi = y0 + 2 * L * i;
            DoubleVector v0 = DoubleVector.fromArray(S, y, yi);
            DoubleVector v1 = DoubleVector.fromArray(S, y, yi + L);
            DoubleVector b0 = DoubleVector.broadcast(S, x[xi]);
            c00 = b0.fma(v0, c00);
            c01 = b0.fma(v1, c01);
            DoubleVector b1 = DoubleVector.broadcast(S, x[xi + 1]);
            c10 = b1.fma(v0, c10);
            c11 = b1.fma(v1, c11);
            DoubleVector b2 = DoubleVector.broadcast(S, x[xi + 2]);
            c20 = b2.fma(v0, c20);
            c21 = b2.fma(v1, c21);
            DoubleVector b3 = DoubleVector.broadcast(S, x[xi + 3]);
            c30 = b3.fma(v0, c30);
            c31 = b3.fma(v1, c31);
            DoubleVector b4 = DoubleVector.broadcast(S, x[xi + 4]);
            c40 = b4.fma(v0, c40);
            c41 = b4.fma(v1, c41);
            DoubleVector b5 = DoubleVector.broadcast(S, x[xi + 5]);
            c50 = b5.fma(v0, c50);
            c51 = b5.fma(v1, c51);
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
     * See {@link Kernels#addTransposedProduct}: lanes run over the k columns of A and G. D's columns are packed
     * into micro-panels of {@link #ROWS} interleaved columns (micro-panel q holds D[r][6q + t] at 6r + t, the last
     * one zero-padded), and A's columns {@link Kernels#GROUP} panels of 2L at a time (panel q holds A[r][..] for
     * r = 0 … n−1, contiguous), so that every block of 6 rows of G reuses a packed group from cache. The last
     * m mod 6 rows and k mod 2L columns of G (a zero-padded panel of A) go through a tile.
     */
    static void addTransposedProduct(double[] d, int dOffset, int n, int m, double[] a, int aOffset, int k,
            double[] g, int gOffset, double[] pack) {
        int width = 2 * L;
        int blocks = (m + ROWS - 1) / ROWS;
        for (int q = 0; q < blocks; q++) {
            int j = q * ROWS;
            packSix(d, dOffset + j, 1, m, n, Math.min(ROWS, m - j), pack, j * n);
        }
        int packA = blocks * ROWS * n;
        int tile = packA + Kernels.GROUP * width * n;
        for (int g0 = 0; g0 < k; g0 += Kernels.GROUP * width) {
            int g1 = Math.min(k, g0 + Kernels.GROUP * width);
            for (int i0 = g0; i0 < g1; i0 += width) {
                int base = packA + (i0 - g0) * n;
                int valid = Math.min(width, k - i0);
                for (int r = 0; r < n; r++) {
                    int from = aOffset + r * k + i0;
                    int to = base + r * width;
                    if (valid == width) {
                        DoubleVector.fromArray(S, a, from).intoArray(pack, to);
                        DoubleVector.fromArray(S, a, from + L).intoArray(pack, to + L);
                    } else {
                        System.arraycopy(a, from, pack, to, valid);
                        java.util.Arrays.fill(pack, to + valid, to + width, 0.0);
                    }
                }
            }
            for (int q = 0; q < blocks; q++) {
                int j = q * ROWS;
                int rows = Math.min(ROWS, m - j);
                for (int i0 = g0; i0 < g1; i0 += width) {
                    int panel = packA + (i0 - g0) * n;
                    int valid = Math.min(width, k - i0);
                    int at = gOffset + j * k + i0;
                    if (rows == ROWS && valid == width) {
                        block6x2(pack, j * n, n, pack, panel, g, at, k);
                    } else {
                        toTile(g, at, k, rows, valid, pack, tile, width);
                        block6x2(pack, j * n, n, pack, panel, pack, tile, width);
                        untile(pack, tile, rows, width, valid, g, at, k);
                    }
                }
            }
        }
    }

    /** Copies {@code valid} columns of {@code rows} ≤ 6 rows of G into a 6 × width tile, zero elsewhere. */
    private static void toTile(double[] g, int g0, int gStride, int rows, int valid, double[] tile, int t0, int width) {
        java.util.Arrays.fill(tile, t0, t0 + ROWS * width, 0.0);
        for (int q = 0; q < rows; q++) {
            System.arraycopy(g, g0 + q * gStride, tile, t0 + q * width, valid);
        }
    }
}
