package settle.engine.train;

import java.util.random.RandomGenerator;
import settle.datasets.Randomness;

/**
 * The random streams of one replicate, derived from (root seed, replicate index) only, so that replicate k of
 * every arm gets the same start and the same mini-batch order whatever the arm does (seed pairing).
 *
 * <ul>
 *   <li>the initialisation stream is seeded with mix(root, k, "init");</li>
 *   <li>the sampling seed is mix(root, k, "sampling"); epoch e's order comes from a fresh generator seeded with
 *       mix(sampling seed, e), so an epoch's permutation depends on (root, k, e) alone and not on how many
 *       numbers earlier epochs consumed.</li>
 * </ul>
 *
 * <p>"mix" folds each value of the tuple into a 64-bit state with {@link Randomness#fold} (the SplitMix64
 * finaliser). Every stream is a {@value #ALGORITHM} generator from {@link Randomness#create}, whose output for a
 * given {@code long} seed is fixed by the JDK's specification of the LXM family.
 *
 * @param algorithm the generator algorithm's name ({@value #ALGORITHM}); goes into manifests
 * @param rootSeed the study's root seed
 * @param replicate the replicate index k (studies number replicates from 1)
 * @param initialisationSeed the derived seed of the initialisation stream
 * @param samplingSeed the derived seed from which every epoch's order is drawn
 */
public record ReplicateSeeds(String algorithm, long rootSeed, int replicate, long initialisationSeed, long samplingSeed) {

    /** The generator algorithm of every stream. */
    public static final String ALGORITHM = Randomness.ALGORITHM;
    private static final long INIT_TAG = 0x696E6974L;         // "init"
    private static final long SAMPLING_TAG = 0x73616D706CL;   // "sampl"

    /** Checks that the seeds are the ones {@link #derive} gives for (root seed, replicate). */
    public ReplicateSeeds {
        if (!ALGORITHM.equals(algorithm)) {
            throw new IllegalArgumentException("generator algorithm must be " + ALGORITHM + ": " + algorithm);
        }
        if (initialisationSeed != mix(rootSeed, replicate, INIT_TAG) || samplingSeed != mix(rootSeed, replicate, SAMPLING_TAG)) {
            throw new IllegalArgumentException("seeds do not derive from root seed " + rootSeed + " and replicate "
                    + replicate + "; use ReplicateSeeds.derive");
        }
    }

    /** @return the streams of replicate {@code replicate} under root seed {@code rootSeed} */
    public static ReplicateSeeds derive(long rootSeed, int replicate) {
        return new ReplicateSeeds(ALGORITHM, rootSeed, replicate, mix(rootSeed, replicate, INIT_TAG),
                mix(rootSeed, replicate, SAMPLING_TAG));
    }

    /** @return a fresh generator for the initialisation stream */
    public RandomGenerator initialisationStream() {
        return generator(initialisationSeed);
    }

    /** @return the seed of epoch {@code epoch}'s order (1-based epoch) */
    public long epochSeed(int epoch) {
        return step(samplingSeed, epoch);
    }

    /** @return a fresh generator for the order of epoch {@code epoch} (1-based) */
    public RandomGenerator epochStream(int epoch) {
        return generator(epochSeed(epoch));
    }

    private static RandomGenerator generator(long seed) {
        return Randomness.create(seed);
    }

    private static long mix(long root, int replicate, long tag) {
        return step(step(step(0L, root), replicate), tag);
    }

    private static long step(long state, long value) {
        return Randomness.fold(state, value);
    }
}
