package settle.engine.model;

import jdk.incubator.vector.DoubleVector;
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

    /** See {@link Kernels#product}: lanes run over the m columns of B and C. */
    static void product(double[] a, int aOffset, int n, int k, double[] b, int bOffset, int m,
            double[] init, int initOffset, double[] c, int cOffset) {
        int j = 0;
        for (; j + 2 * L <= m; j += 2 * L) {
            int r = 0;
            for (; r + 4 <= n; r += 4) {
                product4x2(a, aOffset + r * k, k, b, bOffset + j, m, init, initOffset + j, c, cOffset + r * m + j);
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

    private static DoubleVector start(double[] init, int offset) {
        return init == null ? DoubleVector.zero(S) : DoubleVector.fromArray(S, init, offset);
    }

    private static void product4x2(double[] a, int a0, int k, double[] b, int b0, int m, double[] init, int i0,
            double[] c, int c0) {
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
        int bi = b0;
        for (int i = 0; i < k; i++, bi += m) {
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
        c10.intoArray(c, c0 + m);
        c11.intoArray(c, c0 + m + L);
        c20.intoArray(c, c0 + 2 * m);
        c21.intoArray(c, c0 + 2 * m + L);
        c30.intoArray(c, c0 + 3 * m);
        c31.intoArray(c, c0 + 3 * m + L);
    }

    private static void product1x2(double[] a, int a0, int k, double[] b, int b0, int m, double[] init, int i0,
            double[] c, int c0) {
        DoubleVector c00 = start(init, i0);
        DoubleVector c01 = start(init, i0 + L);
        int bi = b0;
        for (int i = 0; i < k; i++, bi += m) {
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

    /** See {@link Kernels#addTransposedProduct}: lanes run over the k columns of A and G. */
    static void addTransposedProduct(double[] d, int dOffset, int n, int m, double[] a, int aOffset, int k,
            double[] g, int gOffset) {
        int i = 0;
        for (; i + 2 * L <= k; i += 2 * L) {
            int j = 0;
            for (; j + 4 <= m; j += 4) {
                gradient4x2(d, dOffset + j, n, m, a, aOffset + i, k, g, gOffset + j * k + i);
            }
            for (; j < m; j++) {
                gradient1x2(d, dOffset + j, n, m, a, aOffset + i, k, g, gOffset + j * k + i);
            }
        }
        for (; i + L <= k; i += L) {
            for (int j = 0; j < m; j++) {
                gradient1x1(d, dOffset + j, n, m, a, aOffset + i, k, g, gOffset + j * k + i);
            }
        }
        for (; i < k; i++) {
            for (int j = 0; j < m; j++) {
                int gi = gOffset + j * k + i;
                double acc = g[gi];
                for (int r = 0; r < n; r++) {
                    acc = Math.fma(d[dOffset + r * m + j], a[aOffset + r * k + i], acc);
                }
                g[gi] = acc;
            }
        }
    }

    private static void gradient4x2(double[] d, int d0, int n, int m, double[] a, int a0, int k, double[] g, int g0) {
        DoubleVector g00 = DoubleVector.fromArray(S, g, g0);
        DoubleVector g01 = DoubleVector.fromArray(S, g, g0 + L);
        DoubleVector g10 = DoubleVector.fromArray(S, g, g0 + k);
        DoubleVector g11 = DoubleVector.fromArray(S, g, g0 + k + L);
        DoubleVector g20 = DoubleVector.fromArray(S, g, g0 + 2 * k);
        DoubleVector g21 = DoubleVector.fromArray(S, g, g0 + 2 * k + L);
        DoubleVector g30 = DoubleVector.fromArray(S, g, g0 + 3 * k);
        DoubleVector g31 = DoubleVector.fromArray(S, g, g0 + 3 * k + L);
        int dr = d0;
        int ar = a0;
        for (int r = 0; r < n; r++, dr += m, ar += k) {
            DoubleVector v0 = DoubleVector.fromArray(S, a, ar);
            DoubleVector v1 = DoubleVector.fromArray(S, a, ar + L);
            DoubleVector x0 = DoubleVector.broadcast(S, d[dr]);
            g00 = x0.fma(v0, g00);
            g01 = x0.fma(v1, g01);
            DoubleVector x1 = DoubleVector.broadcast(S, d[dr + 1]);
            g10 = x1.fma(v0, g10);
            g11 = x1.fma(v1, g11);
            DoubleVector x2 = DoubleVector.broadcast(S, d[dr + 2]);
            g20 = x2.fma(v0, g20);
            g21 = x2.fma(v1, g21);
            DoubleVector x3 = DoubleVector.broadcast(S, d[dr + 3]);
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

    private static void gradient1x2(double[] d, int d0, int n, int m, double[] a, int a0, int k, double[] g, int g0) {
        DoubleVector g00 = DoubleVector.fromArray(S, g, g0);
        DoubleVector g01 = DoubleVector.fromArray(S, g, g0 + L);
        int dr = d0;
        int ar = a0;
        for (int r = 0; r < n; r++, dr += m, ar += k) {
            DoubleVector x0 = DoubleVector.broadcast(S, d[dr]);
            g00 = x0.fma(DoubleVector.fromArray(S, a, ar), g00);
            g01 = x0.fma(DoubleVector.fromArray(S, a, ar + L), g01);
        }
        g00.intoArray(g, g0);
        g01.intoArray(g, g0 + L);
    }

    private static void gradient1x1(double[] d, int d0, int n, int m, double[] a, int a0, int k, double[] g, int g0) {
        DoubleVector g00 = DoubleVector.fromArray(S, g, g0);
        int dr = d0;
        int ar = a0;
        for (int r = 0; r < n; r++, dr += m, ar += k) {
            g00 = DoubleVector.broadcast(S, d[dr]).fma(DoubleVector.fromArray(S, a, ar), g00);
        }
        g00.intoArray(g, g0);
    }
}
