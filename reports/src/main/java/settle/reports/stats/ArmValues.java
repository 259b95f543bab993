package settle.reports.stats;

/**
 * One arm's per-replicate values of one metric, indexed by replicate (replicate k of every arm shares
 * a seed, so index k pairs them).
 *
 * @param name the arm's name (shown as text; escaping is the renderer's job)
 * @param values value of replicate k; ignored where {@code diverged[k]}. Copied.
 * @param diverged true where replicate k diverged. Copied.
 */
public record ArmValues(String name, double[] values, boolean[] diverged) {

    public ArmValues {
        if (name == null) {
            throw new IllegalArgumentException("an arm needs a name");
        }
        if (values.length != diverged.length) {
            throw new IllegalArgumentException("arm '" + name + "': " + values.length + " values but "
                    + diverged.length + " diverged flags");
        }
        values = values.clone();
        diverged = diverged.clone();
        for (int k = 0; k < values.length; k++) {
            if (!diverged[k] && !Double.isFinite(values[k])) {
                throw new IllegalArgumentException("arm '" + name + "', replicate " + (k + 1) + ": value "
                        + values[k] + " is not finite but the replicate is not marked diverged");
            }
        }
    }

    /** @return an arm with no diverged replicate */
    public static ArmValues finite(String name, double[] values) {
        return new ArmValues(name, values, new boolean[values.length]);
    }

    /** @return a copy of the values */
    @Override
    public double[] values() {
        return values.clone();
    }

    /** @return a copy of the diverged flags */
    @Override
    public boolean[] diverged() {
        return diverged.clone();
    }

    /** @return the number of replicates */
    public int size() {
        return values.length;
    }

    double value(int k) {
        return values[k];
    }

    boolean isDiverged(int k) {
        return diverged[k];
    }
}
