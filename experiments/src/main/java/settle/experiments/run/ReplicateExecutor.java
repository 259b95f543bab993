package settle.experiments.run;

import java.util.List;

/**
 * Runs the replicates of a study somewhere (a local thread pool, a cluster engine) and hands each
 * finished one back to the driver as it arrives. Whatever runs them, the outcomes are the same bytes: the
 * work is a pure function of its key.
 */
public interface ReplicateExecutor {

    /** Receives finished replicates on the driver, one at a time (never concurrently). */
    @FunctionalInterface
    interface Sink {
        void accept(ReplicateOutcome outcome) throws Exception;
    }

    /** @return a short description for the manifest, e.g. "local thread pool, 2 threads" */
    String describe();

    /** @return how many units run at once */
    int parallelism();

    /**
     * Runs every unit (replicate k of one or more arms, see {@link ReplicateWork}) and passes each replicate's
     * outcome to {@code sink} as soon as it arrives. Returns when all are done, or throws the first failure (of a
     * task or of the sink) after stopping the rest.
     *
     * @throws InterruptedException when the driver is interrupted; units in flight are abandoned
     */
    void runAll(List<List<ReplicateKey>> units, ReplicateWork work, Sink sink) throws Exception;
}
