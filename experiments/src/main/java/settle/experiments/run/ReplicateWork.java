package settle.experiments.run;

import java.io.Serializable;
import java.util.List;
import java.util.function.Consumer;

/**
 * Trains one unit of work: replicate k of one or more arms (arms that share their mini-batches train together).
 * Implementations are self-contained and serialisable (a cluster executor ships them to its workers) and
 * deterministic: each outcome depends only on its key.
 */
@FunctionalInterface
public interface ReplicateWork extends Serializable {

    /**
     * @param unit the keys of the unit: one replicate, one or more arms
     * @param each receives each finished replicate as soon as it is done, on the calling thread
     */
    void run(List<ReplicateKey> unit, Consumer<ReplicateOutcome> each) throws Exception;
}
