package settle.engine.model;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.LinkedHashMap;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * Once compiled, no kernel allocates. Vector code the JIT has not compiled yet boxes its vectors, and the compiled
 * form of one kernel can depend on what ran before it (the JDK 17 compiler once boxed a vector per iteration of
 * {@link Kernels#exp} after the ReLU had run, 30 KB per update of an MLP 784-256-10), so every kernel runs in turn,
 * at shapes that take the vector path, each in rounds until one allocates nothing.
 */
class KernelsAllocationTest {

    @Test
    void noKernelAllocatesOnceCompiled() {
        int n = 64;
        int k = 128;
        int m = 10;
        SplittableRandom random = new SplittableRandom(15);
        double[] x = values(random, n * k);
        double[] w = values(random, m * k);
        double[] wide = values(random, k * 64);
        double[] bias = values(random, k);
        double[] c = new double[n * m];
        double[] h = new double[n * k];
        double[] g = new double[m * k];
        double[] z = new double[n * m];
        double[] scratch = new double[n * m];
        double[] pack = new double[Math.max(Kernels.packLength(n, m, k), Kernels.packLength(n, k, 64))];
        Map<String, Runnable> kernels = new LinkedHashMap<>();
        kernels.put("narrow forward", () -> Kernels.multiplyByTransposed(x, 0, n, k, w, 0, m, bias, 0, c, 0, pack));
        kernels.put("wide forward", () -> Kernels.multiplyByTransposed(x, 0, n, 64, wide, 0, k, bias, 0, h, 0, pack));
        kernels.put("gradient", () -> Kernels.addTransposedProduct(c, 0, n, m, x, 0, k, g, 0, pack));
        kernels.put("product", () -> Kernels.product(c, 0, n, m, w, 0, k, null, 0, h, 0));
        kernels.put("relu", () -> Kernels.relu(h, n * k, k));
        kernels.put("mask", () -> Kernels.keepWherePositive(h, x, n * k, k));
        kernels.put("exp", () -> {
            System.arraycopy(x, 0, z, 0, n * m);
            Kernels.exp(z, 0, n * m, scratch);
        });
        for (Map.Entry<String, Runnable> kernel : kernels.entrySet()) {
            long allocated = SteadyAllocation.bytes(kernel.getValue(), 2000);
            // one object per call would be ≥ 16 bytes × 2000 calls; allow the counter's own noise
            assertTrue(allocated < SteadyAllocation.NOISE,
                    kernel.getKey() + " still allocated " + allocated + " bytes in 2000 calls");
        }
    }

    private static double[] values(SplittableRandom random, int count) {
        double[] v = new double[count];
        for (int i = 0; i < count; i++) {
            v[i] = random.nextDouble(-2, 2);
        }
        return v;
    }
}
