package settle.experiments.run;

import java.io.Serializable;

/**
 * Trains one replicate. Implementations are self-contained and serialisable (a cluster executor ships them
 * to its workers) and deterministic: the outcome depends only on the key.
 */
@FunctionalInterface
public interface ReplicateWork extends Serializable {

    /** @return the finished replicate */
    ReplicateOutcome run(ReplicateKey key) throws Exception;
}
