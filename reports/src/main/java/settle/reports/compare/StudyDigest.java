package settle.reports.compare;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import settle.reports.format.Manifest;
import settle.reports.format.Metric;
import settle.reports.format.Study;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.metrics.VerdictSummary;
import settle.reports.stats.Comparison;
import settle.reports.stats.VerdictSentence.Outcome;

/**
 * One study as the comparison across studies sees it: what it trained (data, model, budget, replicates, baseline)
 * and its verdict, taken whole from {@link StudyAnalysis#verdict()} (the same effect, interval and adjusted p as the
 * study's own report; nothing is computed a second way here).
 *
 * @param directory the study directory as given
 * @param name the study's name (the manifest's {@code study})
 * @param dataSource the plan's data source
 * @param trainRows training rows
 * @param testRows test rows
 * @param model the model in words
 * @param parameters the model's parameters P
 * @param epochs the planned epochs (the manifest's {@code training.epochs})
 * @param batch the batch size B (the manifest's {@code training.batch})
 * @param sampling {@code shuffle} or {@code replacement} (the manifest's {@code training.sampling})
 * @param updatesPerEpoch updates in one epoch
 * @param updates the planned updates T of one replicate: epochs × updates per epoch
 * @param replicates replicates per arm
 * @param pairs replicate pairs behind the comparisons (indices present in every arm)
 * @param baseline the baseline's name as recorded
 * @param primary the primary metric (final gap for convex models, final objective otherwise)
 * @param arms every arm other than the baseline, in arm order
 * @param pick the picked arm's name as recorded, or null when the study picks none
 * @param planSha256 SHA-256 of the resolved plan
 * @param dataSha256 SHA-256 of the data
 * @param missing replicate files missing (a partial study)
 * @param diverged replicates that diverged
 */
public record StudyDigest(Path directory, String name, String dataSource, int trainRows, int testRows, String model,
        int parameters, int epochs, int batch, String sampling, int updatesPerEpoch, long updates, int replicates,
        int pairs, String baseline, Metric primary, List<ArmEffect> arms, String pick, String planSha256,
        String dataSha256, int missing, int diverged) {

    public StudyDigest {
        arms = List.copyOf(arms);
    }

    /**
     * One arm's primary effect against its study's baseline.
     *
     * @param name the arm's name as recorded
     * @param comparison its comparison with the baseline on the primary metric (the verdict's)
     * @param outcome what that comparison claims
     * @param picked true when the study picks this arm
     */
    public record ArmEffect(String name, Comparison comparison, Outcome outcome, boolean picked) {
    }

    /**
     * @param analysis the analysed study
     * @return its digest
     */
    public static StudyDigest of(StudyAnalysis analysis) {
        Study study = analysis.study();
        Manifest m = study.manifest();
        VerdictSummary verdict = analysis.verdict();
        String pick = verdict.pick().picked() ? m.arms().get(verdict.pick().arm()) : null;
        List<ArmEffect> arms = new ArrayList<>();
        for (VerdictSummary.ArmVerdict a : verdict.arms()) {
            if (a.arm() == verdict.baseline()) {
                continue;
            }
            arms.add(new ArmEffect(a.name(), a.primary(), a.outcome(), a.arm() == verdict.pick().arm()));
        }
        Manifest.Training training = m.training();
        return new StudyDigest(study.directory(), m.study(), m.dataSource(), m.trainRows(), m.testRows(), m.model(),
                m.parameters(), training.epochs(), training.batch(), training.sampling(), m.updatesPerEpoch(),
                m.plannedUpdates(), study.replicateCount(), verdict.pairs(), m.baseline(), verdict.primary(), arms,
                pick, m.planSha256(), m.dataSha256(), study.missing(), study.diverged());
    }

    /** @return the arm named {@code name} (not the baseline), or null when the study has none of that name */
    public ArmEffect arm(String name) {
        for (ArmEffect a : arms) {
            if (a.name().equals(name)) {
                return a;
            }
        }
        return null;
    }

    /** @return the budget in words: "50 epochs × 15 updates (batch 32, shuffle) = 750 updates" */
    public String budget() {
        return epochs + (epochs == 1 ? " epoch" : " epochs") + " × " + updatesPerEpoch + " updates (batch " + batch
                + ", " + sampling + ") = " + updates + " updates";
    }
}
