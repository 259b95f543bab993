package settle.engine.schedule;

/**
 * A way of driving the learning rate: immutable, validated on construction, and the same YAML map in a
 * plan and on the command line ({@code {kind: reciprocal, rate: 0.2, decay: 1}}).
 */
public interface Schedule {

    /** @return the kind, as written in a plan ({@code constant}, {@code reciprocal}, …) */
    String kind();

    /** @return a fresh per-replicate driver for a run of the given shape */
    RateDriver start(RunShape shape);
}
