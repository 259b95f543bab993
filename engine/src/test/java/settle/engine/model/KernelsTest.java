package settle.engine.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The products' exactness contract ({@link Kernels}): every output is one {@link Math#fma} chain over the summed
 * index in ascending order, so the vector path, the scalar fallback and a plain triple loop written here agree
 * bit for bit (tolerance 0) on every shape, including ones that leave partial register blocks and vector tails, and
 * one deep and tall enough to cross the cache blocks of the summed index and of the rows.
 */
class KernelsTest {

    /** Bit-identical: the paths differ only in which independent outputs are computed together. */
    private static final double EXACT = 0.0;

    private static final int[][] SHAPES = {
        {1, 1, 1}, {3, 5, 7}, {4, 8, 8}, {5, 9, 10}, {7, 13, 17}, {8, 16, 3}, {13, 50, 10}, {64, 31, 33}, {9, 2, 64},
        {37, 70, 45}, {101, 530, 19}, {110, 41, 36}, {54, 12, 24},
        // outputs narrower than a register block: whole and partial blocks of rows
        {64, 50, 10}, {70, 128, 10}, {33, 7, 13}, {16, 3, 1}, {19, 30, 6}};

    @Test
    void theSurefireRunUsesTheVectorPath() {
        assertTrue(Kernels.vectorised(), "surefire's argLine adds jdk.incubator.vector, so the vector path must run: "
                + Kernels.describe());
    }

    @Test
    void productAgreesWithTheScalarPathAndThePlainLoop() {
        SplittableRandom random = new SplittableRandom(11);
        for (int[] shape : SHAPES) {
            int n = shape[0];
            int k = shape[1];
            int m = shape[2];
            double[] a = gaussian(random, 3 + n * k);
            double[] b = gaussian(random, 5 + k * m);
            double[] init = gaussian(random, 2 + m);
            for (boolean withInit : new boolean[] {true, false}) {
                double[] expected = new double[1 + n * m];
                for (int r = 0; r < n; r++) {
                    for (int j = 0; j < m; j++) {
                        double acc = withInit ? init[2 + j] : 0.0;
                        for (int i = 0; i < k; i++) {
                            acc = Math.fma(a[3 + r * k + i], b[5 + i * m + j], acc);
                        }
                        expected[1 + r * m + j] = acc;
                    }
                }
                double[] vector = new double[1 + n * m];
                double[] scalar = new double[1 + n * m];
                Kernels.product(a, 3, n, k, b, 5, m, withInit ? init : null, 2, vector, 1);
                Kernels.scalarProduct(a, 3, n, k, b, 5, m, withInit ? init : null, 2, scalar, 1);
                assertArrayEquals(expected, vector, EXACT, () -> "product " + n + "x" + k + "x" + m);
                assertArrayEquals(expected, scalar, EXACT, () -> "scalar product " + n + "x" + k + "x" + m);
                // the same chains taken from W = Bᵀ (m × k) without a transpose
                double[] w = new double[4 + m * k];
                for (int i = 0; i < k; i++) {
                    for (int j = 0; j < m; j++) {
                        w[4 + j * k + i] = b[5 + i * m + j];
                    }
                }
                double[] direct = new double[1 + n * m];
                Kernels.productTransposed(a, 3, n, k, w, 4, m, withInit ? init : null, 2, direct, 1);
                assertArrayEquals(expected, direct, EXACT, () -> "productTransposed " + n + "x" + k + "x" + m);
                double[] packed = new double[1 + n * m];
                double[] pack = new double[Kernels.packLength(n, m, k)];
                Kernels.multiplyByTransposed(a, 3, n, k, w, 4, m, withInit ? init : null, 2, packed, 1, pack);
                assertArrayEquals(expected, packed, EXACT, () -> "multiplyByTransposed " + n + "x" + k + "x" + m);
            }
        }
    }

    @Test
    void transposedProductAgreesWithTheScalarPathAndThePlainLoop() {
        SplittableRandom random = new SplittableRandom(12);
        for (int[] shape : SHAPES) {
            int n = shape[0];
            int m = shape[1];
            int k = shape[2];
            double[] d = gaussian(random, 2 + n * m);
            double[] a = gaussian(random, 1 + n * k);
            double[] g = gaussian(random, 3 + m * k);
            double[] expected = g.clone();
            for (int j = 0; j < m; j++) {
                for (int i = 0; i < k; i++) {
                    double acc = expected[3 + j * k + i];
                    for (int r = 0; r < n; r++) {
                        acc = Math.fma(d[2 + r * m + j], a[1 + r * k + i], acc);
                    }
                    expected[3 + j * k + i] = acc;
                }
            }
            double[] vector = g.clone();
            double[] scalar = g.clone();
            Kernels.addTransposedProduct(d, 2, n, m, a, 1, k, vector, 3, new double[Kernels.packLength(n, m, k)]);
            Kernels.scalarAddTransposedProduct(d, 2, n, m, a, 1, k, scalar, 3);
            assertArrayEquals(expected, vector, EXACT, () -> "addTransposedProduct " + n + "x" + m + "x" + k);
            assertArrayEquals(expected, scalar, EXACT, () -> "scalar addTransposedProduct " + n + "x" + m + "x" + k);
        }
    }

    @Test
    void reluAndItsMaskAgreeWithThePlainLoop() {
        SplittableRandom random = new SplittableRandom(13);
        int width = 16;
        int count = 7 * width;
        double[] z = gaussian(random, count);
        z[3] = -0.0;
        z[20] = 0.0;
        double[] expected = new double[count];
        for (int i = 0; i < count; i++) {
            expected[i] = Math.max(z[i], 0.0);
        }
        double[] relu = z.clone();
        Kernels.relu(relu, count, width);
        assertArrayEquals(expected, relu, EXACT, "relu");
        assertTrue(Double.doubleToRawLongBits(relu[3]) == 0L, "max(−0, 0) is +0");
        double[] d = gaussian(random, count);
        double[] masked = d.clone();
        for (int i = 0; i < count; i++) {
            if (!(relu[i] > 0)) {
                masked[i] = 0.0;
            }
        }
        double[] kept = d.clone();
        Kernels.keepWherePositive(kept, relu, count, width);
        assertArrayEquals(masked, kept, EXACT, "mask");
    }

    @Test
    void expMatchesStrictMathWithinOneUlpAndIsTheSameOnBothPaths() {
        SplittableRandom random = new SplittableRandom(14);
        int count = 200_003; // not a whole number of vectors: the scalar tail runs too
        double[] x = new double[count];
        for (int i = 0; i < count; i++) {
            // mostly the soft-max's range (z − max z ≤ 0), some of the whole finite range
            x[i] = i % 4 == 0 ? random.nextDouble(-745.2, 709.78) : random.nextDouble(-40, 0);
        }
        double[] special = {0.0, -0.0, 1.0, -1.0, Math.log(2) / 2, -Math.log(2) / 2, 1e-300, -1e-300, -707.99,
            -708.0, -708.4, -740.0, -745.13, -745.2, -746.0, -746.1, -1e300, Double.NEGATIVE_INFINITY, 709.78,
            709.782712893384, 709.8, 710.0, 711.0, Double.POSITIVE_INFINITY, Double.NaN};
        System.arraycopy(special, 0, x, 1, special.length);
        double[] vector = x.clone();
        Kernels.exp(vector, 0, count, new double[count]);
        double worst = 0;
        for (int i = 0; i < count; i++) {
            double scalar = Kernels.exp(x[i]);
            int at = i;
            assertEquals(Double.doubleToLongBits(scalar), Double.doubleToLongBits(vector[i]),
                    () -> "exp(" + x[at] + "): scalar " + scalar + ", array " + vector[at]);
            if (x[i] >= -745.2 && x[i] <= 709.78) {
                // java.lang.StrictMath.exp (JDK 17): fdlibm 5.3's e_exp.c, documented error below 1 ulp
                double reference = StrictMath.exp(x[i]);
                worst = Math.max(worst, Math.abs(scalar - reference) / Math.ulp(reference));
            }
        }
        assertTrue(worst <= 1.0, "largest difference from StrictMath.exp: " + worst + " ulp");
        assertEquals(1.0, Kernels.exp(0.0), EXACT);
        // e^−744 = 1.5528… · 2^−1074 (Python 3.11 decimal, 50 digits): rounds to 2 · 2^−1074
        assertEquals(Double.MIN_VALUE * 2, Kernels.exp(-744.0), EXACT, "subnormal results round once");
        assertEquals(0.0, Kernels.exp(-746.1), EXACT);
        assertEquals(0.0, Kernels.exp(Double.NEGATIVE_INFINITY), EXACT);
        assertEquals(Double.POSITIVE_INFINITY, Kernels.exp(710.0), EXACT);
        assertEquals(Double.POSITIVE_INFINITY, Kernels.exp(Double.POSITIVE_INFINITY), EXACT);
        assertTrue(Double.isNaN(Kernels.exp(Double.NaN)));
        assertTrue(Kernels.exp(709.78) < Double.MAX_VALUE, "e^709.78 is finite");
        assertEquals(Double.POSITIVE_INFINITY, Kernels.exp(709.8), EXACT);
    }

    private static double[] gaussian(SplittableRandom random, int count) {
        double[] values = new double[count];
        for (int i = 0; i < count; i++) {
            values[i] = random.nextDouble(-2, 2);
        }
        return values;
    }
}
