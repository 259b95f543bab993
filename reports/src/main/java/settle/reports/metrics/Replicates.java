package settle.reports.metrics;

import java.util.ArrayList;
import java.util.List;
import settle.reports.format.Prediction;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * Which replicate files a section reads when it shows one value for an arm or for the study: the first present
 * replicate, the first finished one that records its tail, the replicates whose rates differ. Each is a plain scan in
 * replicate order.
 */
public final class Replicates {

    private Replicates() {
    }

    /**
     * @param study the study
     * @param arm the arm (0-based)
     * @return the first present replicate of the arm (finished or diverged), or null when every file is missing
     */
    public static Replicate first(Study study, int arm) {
        for (Replicate r : study.replicates().get(arm)) {
            if (r != null) {
                return r;
            }
        }
        return null;
    }

    /**
     * @param study the study
     * @param arm the arm (0-based)
     * @return the tail of the arm's first finished replicate that records one, or null
     */
    public static Replicate.Tail firstTail(Study study, int arm) {
        for (Replicate r : study.replicates().get(arm)) {
            if (r != null && !r.diverged() && r.tail() != null) {
                return r.tail();
            }
        }
        return null;
    }

    /**
     * @param study the study
     * @param k the replicate index (0-based)
     * @return replicate k of the first arm that has it (its seeds are every arm's), or null when no arm has it
     */
    public static Replicate firstOfIndex(Study study, int k) {
        Replicate r = null;
        for (int a = 0; a < study.armCount() && r == null; a++) {
            r = study.replicate(a, k);
        }
        return r;
    }

    /**
     * @param study the study
     * @param arm the arm (0-based)
     * @return true when a plateau schedule cut the rate of some replicate of the arm
     */
    public static boolean cut(Study study, int arm) {
        for (Replicate r : study.replicates().get(arm)) {
            if (r != null && !r.plateauCuts().isEmpty()) {
                return true;
            }
        }
        return false;
    }

    /** @return true when a plateau schedule cut the rate of some replicate of some arm */
    public static boolean anyCut(Study study) {
        for (int a = 0; a < study.armCount(); a++) {
            if (cut(study, a)) {
                return true;
            }
        }
        return false;
    }

    /**
     * @param study the study
     * @param arm the arm (0-based)
     * @return the replicates whose rates stand for the arm: every present one when a plateau schedule cut some
     *     replicate's rate (their rates differ), else the first present one (every replicate has its rates); empty
     *     when every file is missing
     */
    public static List<Replicate> withOwnRates(Study study, int arm) {
        List<Replicate> out = new ArrayList<>();
        if (cut(study, arm)) {
            for (Replicate r : study.replicates().get(arm)) {
                if (r != null) {
                    out.add(r);
                }
            }
        } else if (first(study, arm) != null) {
            out.add(first(study, arm));
        }
        return out;
    }

    /** @return the number of epochs of the longest present replicate of any arm (0 when none) */
    public static int epochs(Study study) {
        int e = 0;
        for (List<Replicate> arm : study.replicates()) {
            for (Replicate r : arm) {
                if (r != null) {
                    e = Math.max(e, r.epochs().size());
                }
            }
        }
        return e;
    }

    /**
     * What the replicates' predictions say about themselves, for the distance section.
     *
     * @param example the first prediction made (in arm, then replicate order), whose label says what the
     *     prediction is; null when none was made
     * @param skipped the reason of the first prediction skipped, or null when none was skipped
     */
    public record Predictions(Prediction example, String skipped) {
    }

    /** @return the study's {@link Predictions} */
    public static Predictions predictions(Study study) {
        Prediction label = null;
        String skipped = null;
        for (List<Replicate> arm : study.replicates()) {
            for (Replicate r : arm) {
                if (r == null) {
                    continue;
                }
                if (r.prediction().predicted() && label == null) {
                    label = r.prediction();
                } else if (!r.prediction().predicted() && skipped == null) {
                    skipped = r.prediction().skipped();
                }
            }
        }
        return new Predictions(label, skipped);
    }
}
