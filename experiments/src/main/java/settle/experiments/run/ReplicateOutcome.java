package settle.experiments.run;

import java.io.Serializable;

/**
 * What one finished replicate hands back to the driver: its replicate file, byte for byte, and the little
 * the progress display needs.
 *
 * @param key which replicate
 * @param file the replicate JSON exactly as it is written to {@code arms/<arm>/<replicate>.json}
 * @param diverged whether the replicate diverged
 * @param updates the updates it ran
 */
public record ReplicateOutcome(ReplicateKey key, byte[] file, boolean diverged, long updates) implements Serializable {
}
