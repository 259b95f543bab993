package settle.datasets;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** The one seed scheme: SplitMix64 and the fold every derived seed comes from. */
class RandomnessTest {

    @Test
    void splitMix64IsTheJdksSplittableRandom() {
        // java.util.SplittableRandom (Java 17) is SplitMix64 with the same γ and "Mix13" finaliser (Steele, Lea &
        // Flood, OOPSLA 2014): an independent implementation of the generator and of the finaliser the seeds fold with
        for (long seed : new long[] {0, 1, -7, 2026, Long.MIN_VALUE}) {
            SplittableRandom jdk = new SplittableRandom(seed);
            Randomness.SplitMix64 ours = new Randomness.SplitMix64(seed);
            for (int i = 0; i < 5; i++) {
                assertEquals(jdk.nextLong(), ours.nextLong(), "seed " + seed + ", draw " + i);
            }
            assertEquals(new SplittableRandom(seed).nextLong(), Randomness.finalise(seed + 0x9E3779B97F4A7C15L));
        }
    }

    @Test
    void foldIsTheFinaliserOfStateXorADrawOfSplitMix64() {
        for (long state : new long[] {0, 5, -3}) {
            for (long value : new long[] {0, 1, 42}) {
                long expected = Randomness.finalise(state ^ new SplittableRandom(value * 0x9E3779B97F4A7C15L).nextLong());
                assertEquals(expected, Randomness.fold(state, value));
            }
        }
    }

    @Test
    void indicesStayInRangeAndCoverIt() {
        Randomness.SplitMix64 random = new Randomness.SplitMix64(9);
        int[] counts = new int[7];
        for (int i = 0; i < 7000; i++) {
            counts[random.nextIndex(7)]++;
        }
        for (int c : counts) {
            assertTrue(c > 800 && c < 1200, "counts " + java.util.Arrays.toString(counts));
        }
    }
}
