package settle.engine.model;

import java.util.random.RandomGenerator;

/** Starting points shared by the models: one weight block at a time; biases are always 0. */
final class Starts {

    private Starts() {
    }

    /**
     * Fills the weight block {@code theta[offset .. offset + rows·cols)} of a layer with {@code cols} inputs
     * (fan-in) and {@code rows} outputs (fan-out), drawing one value per weight in θ order.
     *
     * @param theta modified
     * @param rng advanced (nothing drawn for {@link Initialisation#ZEROS})
     */
    static void fillWeights(double[] theta, int offset, int rows, int cols, Initialisation init, RandomGenerator rng) {
        int count = rows * cols;
        switch (init) {
            case ZEROS -> java.util.Arrays.fill(theta, offset, offset + count, 0.0);
            case GLOROT -> {
                double limit = Math.sqrt(6.0 / (cols + rows));
                for (int i = 0; i < count; i++) {
                    theta[offset + i] = limit * (2.0 * rng.nextDouble() - 1.0);
                }
            }
            case HE -> {
                double sd = Math.sqrt(2.0 / cols);
                for (int i = 0; i < count; i++) {
                    theta[offset + i] = sd * rng.nextGaussian();
                }
            }
            case REFERENCE -> throw referenceRefused();
        }
    }

    static IllegalArgumentException referenceRefused() {
        return new IllegalArgumentException("model.init: reference starts at the reference minimiser θ*, which "
                + "the caller must compute and copy in; the model itself accepts zeros, glorot or he");
    }

    static void checkLength(String what, double[] array, int expected) {
        if (array.length != expected) {
            throw new IllegalArgumentException(what + " has length " + array.length + ", expected " + expected);
        }
    }

    static void checkRows(int n, int capacity) {
        if (n < 1 || n > capacity) {
            throw new IllegalArgumentException("batch of " + n + " rows, expected 1.." + capacity
                    + " (the workspace's capacity)");
        }
    }
}
