package settle.engine.schedule;

import java.util.Map;
import settle.input.BadInputException;

/**
 * A way of driving the learning rate: immutable, validated on construction, and the same YAML map in a
 * plan and on the command line ({@code {kind: reciprocal, rate: 0.2, decay: 1}}). Build one with
 * {@link Schedules#parse}.
 *
 * <p>Counters: {@code epoch} = 1 for the first pass, {@code update} = 1 for the first update, progress =
 * (update − 1) / total updates (or (epoch − 1) / epochs with {@code per: epoch}), in [0, 1): so
 * progress-based kinds never quite reach their floor.
 */
public interface Schedule {

    /** @return the kind, as written in a plan ({@code constant}, {@code reciprocal}, …) */
    String kind();

    /** @return a fresh per-replicate driver for a run of the given shape */
    RateDriver start(RunShape shape);

    /** @return the warmup (possibly {@link Warmup#NONE}) */
    Warmup warmup();

    /** @return how Σα and Σα² behave as the run grows without bound */
    Asymptotics asymptotics();

    /** @return the formula with its parameters, on one line */
    String describe();

    /**
     * @return the schedule map with every default filled in, in the order of DESIGN.md's table ({@code kind}
     *     first); {@link Schedules#parse} of it gives an equal schedule. The map is a fresh, mutable copy.
     */
    Map<String, Object> resolved();

    /**
     * Lists the rate of every update of a planned run without any data (plateau: its no-cut envelope).
     *
     * @return a fresh array, element u − 1 the rate of update u
     * @throws BadInputException when the schedule does not fit the run (a warmup longer than the run; a
     *     formula giving a negative or non-finite rate)
     */
    default double[] plannedRates(RunShape shape) {
        long total = shape.totalUpdates();
        if (total > Integer.MAX_VALUE - 8) {
            throw new IllegalArgumentException("a run of " + total + " updates is too long to list");
        }
        RateDriver driver = start(shape);
        double[] out = new double[(int) total];
        long update = 1;
        for (int epoch = 1; epoch <= shape.epochs(); epoch++) {
            for (int i = 0; i < shape.updatesPerEpoch(); i++) {
                out[(int) (update - 1)] = driver.rate(epoch, update);
                update++;
            }
        }
        return out;
    }

    /** @return Σα and Σα² over the planned run (plateau: its no-cut envelope) */
    default RateSums sums(RunShape shape) {
        return RateSums.of(plannedRates(shape));
    }
}
