package settle.datasets;

import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;

/**
 * The one place settle derives seeds and makes random streams, for every module (the other modules depend on this
 * one): {@value #ALGORITHM} from {@code java.util.random}, created from a 64-bit seed, and the SplitMix64
 * generator and finaliser (Steele, Lea &amp; Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014)
 * from which every derived seed comes: a plan's split seeds are the first outputs of {@link SplitMix64} seeded with
 * the root seed, a replicate's seeds fold (root, replicate, stream) with {@link #fold}, and bootstrap resamples
 * draw from {@link SplitMix64}. The algorithm's output for a seed is fixed by its specification, and the only
 * derived quantities used here are {@link RandomGenerator#nextDouble()} (53 high bits of a 64-bit draw),
 * {@link RandomGenerator#nextInt(int)} and normal deviates computed with {@link StrictMath}
 * ({@link Normal}), so every result is bit-identical on every JVM and platform.
 */
public final class Randomness {

    /** The generator algorithm (recorded in study manifests). */
    public static final String ALGORITHM = "L64X128MixRandom";

    private Randomness() {
    }

    /** The factory of {@value #ALGORITHM} generators (immutable; looked up once). */
    private static final RandomGeneratorFactory<RandomGenerator> FACTORY = RandomGeneratorFactory.of(ALGORITHM);

    /** γ = ⌊2⁶⁴/φ⌋, odd: SplitMix64's increment. */
    private static final long GOLDEN_GAMMA = 0x9E3779B97F4A7C15L;

    /** @return a fresh {@value #ALGORITHM} generator seeded with {@code seed} */
    public static RandomGenerator create(long seed) {
        return FACTORY.create(seed);
    }

    /**
     * The SplitMix64 output function (Stafford's "Mix13" variant of MurmurHash3's finaliser); the JDK's
     * {@code java.util.SplittableRandom} uses the same function.
     */
    public static long finalise(long z) {
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }

    /**
     * Folds {@code value} into {@code state}: finalise(state XOR finalise((value + 1)·γ)), the inner term being
     * output value + 1 of SplitMix64 seeded with 0; a tuple folded value by value from 0 gives a seed that depends
     * on the whole tuple.
     */
    public static long fold(long state, long value) {
        return finalise(state ^ finalise(value * GOLDEN_GAMMA + GOLDEN_GAMMA));
    }

    /**
     * The SplitMix64 generator, written out so that its draws are fixed by the published constants on every JVM.
     * Its {@code n}th output for seed s is finalise(s + n·γ), as {@code java.util.SplittableRandom}'s
     * {@code nextLong}. One instance per loop; not shared between threads.
     */
    public static final class SplitMix64 {

        private long state;

        /** @param seed the generator's seed */
        public SplitMix64(long seed) {
            this.state = seed;
        }

        /** @return the next 64 random bits */
        public long nextLong() {
            state += GOLDEN_GAMMA;
            return finalise(state);
        }

        /**
         * @param bound exclusive upper bound, at least 1
         * @return a uniformly distributed integer in [0, bound), without modulo bias (rejection as in
         *         {@code java.util.Random#nextInt(int)})
         */
        public int nextIndex(int bound) {
            long b = bound;
            while (true) {
                long bits = nextLong() >>> 1;
                long value = bits % b;
                if (bits - value + (b - 1) >= 0) {
                    return (int) value;
                }
            }
        }
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
