package settle.engine.train;

import java.util.random.RandomGenerator;

/**
 * The row order of an epoch, a function of (root seed, replicate, epoch) alone: what {@link Trainer} visits when no
 * explicit orders are given, and what a replay file can be made from.
 */
public final class SampleOrders {

    private SampleOrders() {
    }

    /** @return the length of an epoch's order: N for shuffle, ⌈N/B⌉·B for replacement */
    public static int length(Sampling sampling, int rows, int batch) {
        if (rows < 1 || batch < 1) {
            throw new IllegalArgumentException("rows and batch must be ≥ 1: " + rows + ", " + batch);
        }
        return sampling == Sampling.SHUFFLE ? rows : (int) ((rows + (long) batch - 1) / batch) * batch;
    }

    /**
     * Fills {@code out} with epoch {@code epoch}'s order: for shuffle a permutation of 0..N−1 (Fisher–Yates from
     * the identity, i = N−1 down to 1 swapping with {@code nextInt(i + 1)}), for replacement
     * {@code out.length} independent {@code nextInt(N)} draws; both from {@link ReplicateSeeds#epochStream}.
     *
     * @param out receives {@link #length} indices; modified
     */
    public static void fill(ReplicateSeeds seeds, Sampling sampling, int rows, int epoch, int[] out) {
        RandomGenerator rng = seeds.epochStream(epoch);
        if (sampling == Sampling.SHUFFLE) {
            if (out.length != rows) {
                throw new IllegalArgumentException("a shuffle order has " + rows + " indices, buffer holds " + out.length);
            }
            for (int i = 0; i < rows; i++) {
                out[i] = i;
            }
            for (int i = rows - 1; i > 0; i--) {
                int j = rng.nextInt(i + 1);
                int swap = out[i];
                out[i] = out[j];
                out[j] = swap;
            }
        } else {
            for (int i = 0; i < out.length; i++) {
                out[i] = rng.nextInt(rows);
            }
        }
    }

    /** @return the orders of epochs 1..{@code epochs}, one array each */
    public static int[][] all(ReplicateSeeds seeds, Sampling sampling, int rows, int batch, int epochs) {
        int[][] orders = new int[epochs][length(sampling, rows, batch)];
        for (int e = 1; e <= epochs; e++) {
            fill(seeds, sampling, rows, e, orders[e - 1]);
        }
        return orders;
    }
}
