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

    /** @return how many replicates run at once */
    int parallelism();

    /**
     * Runs every key and passes each outcome to {@code sink} as it finishes. Returns when all are done, or
     * throws the first failure (of a task or of the sink) after stopping the rest.
     *
     * @throws InterruptedException when the driver is interrupted; replicates in flight are abandoned
     */
    void runAll(List<ReplicateKey> keys, ReplicateWork work, Sink sink) throws Exception;
}
