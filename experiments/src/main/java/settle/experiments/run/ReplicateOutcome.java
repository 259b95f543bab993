package settle.experiments.run;

import java.io.Serializable;

/**
 * What one finished replicate hands back to the driver: its replicate file, byte for byte, and what the driver keeps
 * of it in memory (its status, its rows of {@code epochs.csv}) so that it never reads the file back.
 *
 * @param key which replicate
 * @param file the replicate's two files exactly as they are written to {@code arms/<arm>/<replicate>.json} and
 *     {@code .bin}
 * @param diverged whether the replicate diverged
 * @param updates the updates it ran
 * @param epochRows its rows of {@code epochs.csv}
 */
public record ReplicateOutcome(ReplicateKey key, settle.reports.format.ReplicateJson.Written file, boolean diverged, long updates, String epochRows)
        implements Serializable {
}
