package settle.reports.stats;

/**
 * The SplitMix64 generator (Steele, Lea &amp; Flood, "Fast splittable pseudorandom number generators",
 * OOPSLA 2014), written out here so that bootstrap resamples are identical on every JVM: the
 * constants below are the published ones, and nothing depends on a library's unspecified choice.
 * One instance per resampling run; not shared between threads.
 */
final class SplitMix64 {

    private static final long GOLDEN_GAMMA = 0x9E3779B97F4A7C15L;

    private long state;

    SplitMix64(long seed) {
        this.state = seed;
    }

    /** @return the next 64 random bits */
    long nextLong() {
        long z = (state += GOLDEN_GAMMA);
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }

    /**
     * @param bound exclusive upper bound, at least 1
     * @return a uniformly distributed integer in [0, bound), without modulo bias (rejection as in
     *         {@code java.util.Random#nextInt(int)})
     */
    int nextIndex(int bound) {
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
