package settle.reports.format;

import java.nio.file.Path;
import java.util.List;
import settle.reports.text.Names;

/**
 * A study directory as read by {@link StudyReader}.
 *
 * @param directory the study directory
 * @param manifest the manifest
 * @param planText {@code plan.yaml} as written (the resolved plan), for the provenance section
 * @param reference θ* and its curvature, or null for a model with no reference minimiser
 * @param encoding how the data's columns became the inputs, and the test labels; null for a study written before
 *     settle recorded it
 * @param replicates {@code replicates.get(a).get(k)} is replicate k + 1 of arm a + 1, or null when its file
 *     is missing
 * @param nudgeLog the rows of {@code nudges.csv} in the order applied (empty when the study has none)
 */
public record Study(Path directory, Manifest manifest, String planText, Reference reference, EncodingRecord encoding,
        List<List<Replicate>> replicates, List<NudgeRecord> nudgeLog) {

    public Study {
        if (replicates.size() != manifest.arms().size()) {
            throw new IllegalArgumentException("replicates of " + replicates.size() + " arms for "
                    + manifest.arms().size() + " arms in the manifest");
        }
        replicates = replicates.stream().map(java.util.Collections::unmodifiableList).toList();
        nudgeLog = List.copyOf(nudgeLog);
    }

    /** @return the number of arms */
    public int armCount() {
        return manifest.arms().size();
    }

    /** @return replicates per arm */
    public int replicateCount() {
        return manifest.replicates();
    }

    /**
     * @return the arm's name (0-based index) as the report shows it: isolated for bidirectional text, its invisible
     *     characters made visible ({@link Names}); the name as recorded is {@code manifest().arms().get(arm)}
     */
    public String armName(int arm) {
        return Names.shown(manifest.arms().get(arm));
    }

    /** @return replicate k (0-based) of arm a (0-based), or null when missing */
    public Replicate replicate(int arm, int k) {
        return replicates.get(arm).get(k);
    }

    /** @return the number of replicate files missing */
    public int missing() {
        int n = 0;
        for (List<Replicate> arm : replicates) {
            for (Replicate r : arm) {
                if (r == null) {
                    n++;
                }
            }
        }
        return n;
    }

    /** @return the number of replicates that diverged */
    public int diverged() {
        int n = 0;
        for (List<Replicate> arm : replicates) {
            for (Replicate r : arm) {
                if (r != null && r.diverged()) {
                    n++;
                }
            }
        }
        return n;
    }

    /**
     * @return the name of input j (0-based) as the report shows it ({@link Names#shown}): the manifest's feature
     *     name, which is the encoding's output name (a one-hot level {@code colour=red}, {@code glucose (was missing)})
     */
    public String featureName(int j) {
        return Names.shown(manifest.featureNames().get(j));
    }

    /** @return true for a convex model (a reference minimiser exists) */
    public boolean convex() {
        return reference != null;
    }
}
