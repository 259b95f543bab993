package settle.datasets;

import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;

/**
 * The one random-number source of the datasets module: {@value #ALGORITHM} from {@code java.util.random},
 * created from a 64-bit seed. The algorithm's output for a seed is fixed by its specification, and the only
 * derived quantities used here are {@link RandomGenerator#nextDouble()} (53 high bits of a 64-bit draw),
 * {@link RandomGenerator#nextInt(int)} and normal deviates computed with {@link StrictMath}
 * ({@link Normal}), so every result is bit-identical on every JVM and platform.
 */
public final class Randomness {

    /** The generator algorithm (recorded in study manifests). */
    public static final String ALGORITHM = "L64X128MixRandom";

    private Randomness() {
    }

    /** @return a fresh {@value #ALGORITHM} generator seeded with {@code seed} */
    public static RandomGenerator create(long seed) {
        return RandomGeneratorFactory.of(ALGORITHM).create(seed);
    }

    /**
     * Standard normal deviates by the Box–Muller transform with {@link StrictMath} (G. E. P. Box and
     * M. E. Muller, "A note on the generation of random normal deviates", Ann. Math. Statist. 29 (1958)
     * 610–611), so the values do not depend on the JVM's {@code nextGaussian} or on platform intrinsics.
     * Not thread-safe; one per generating loop.
     */
    public static final class Normal {
        private final RandomGenerator random;
        private double spare;
        private boolean hasSpare;

        /** @param random the uniform source (consumed two doubles per pair of deviates) */
        public Normal(RandomGenerator random) {
            this.random = random;
        }

        /** @return the next N(0, 1) deviate */
        public double next() {
            if (hasSpare) {
                hasSpare = false;
                return spare;
            }
            double u1 = 1.0 - random.nextDouble(); // in (0, 1]: log is finite
            double u2 = random.nextDouble();
            double r = StrictMath.sqrt(-2.0 * StrictMath.log(u1));
            double a = 2.0 * StrictMath.PI * u2;
            spare = r * StrictMath.sin(a);
            hasSpare = true;
            return r * StrictMath.cos(a);
        }
    }
}
