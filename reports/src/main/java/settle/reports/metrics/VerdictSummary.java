package settle.reports.metrics;

import com.fasterxml.jackson.core.JsonGenerator;
import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.Comparison;
import settle.reports.stats.VerdictSentence;
import settle.reports.stats.VerdictSentence.Outcome;
import settle.reports.format.Metric;
import settle.reports.format.Replicate;
import settle.reports.format.Study;
import settle.reports.text.Format;
import settle.reports.text.Names;

/**
 * The verdict in words, once, for the report's verdict section, the terminal and the JSON summary: for every arm
 * where its returned iterate ends against the baseline's (the primary metric) and how much it still moves (tail
 * radius), with a diagnosis; the pick ({@link ArmPick}); and, when there is none, what would help.
 *
 * <p>Diagnoses: an arm that settles detectably tighter (smaller tail radius) but ends detectably farther from the
 * minimum (larger primary metric) "froze before reaching the minimum: its rate fell too fast for this budget"; a
 * replicate whose final objective is above its starting objective "did not learn" (it is kept in every comparison,
 * and counted here); a baseline that has not reached its noise ball gets {@link BallDiagnosis}'s sentence.
 *
 * @param primary the primary metric
 * @param baseline the baseline's arm index (0-based)
 * @param baselineName its name as recorded (the terminal and the page show it through {@link settle.reports.text.Names})
 * @param arms every arm's verdict, in arm order (the baseline's has no comparison)
 * @param pick the pick
 * @param pickSentence the pick in one sentence, or why there is none and what would help
 * @param baselineNote the baseline's noise-ball diagnosis when it has not reached its ball, or ""
 * @param pairs replicate pairs behind the comparisons
 * @param pairsNeeded the pairs a verdict needs at this number of arms
 * @param classCaution the warning that per-class figures rest on few test rows ({@link ClassBalance#caution}), or ""
 */
public record VerdictSummary(Metric primary, int baseline, String baselineName, List<ArmVerdict> arms, ArmPick pick,
        String pickSentence, String baselineNote, int pairs, int pairsNeeded, String classCaution) {

    /**
     * One arm's verdict.
     *
     * @param arm its index (0-based)
     * @param name its name as recorded
     * @param primary its comparison with the baseline on the primary metric (null for the baseline)
     * @param outcome what that comparison claims
     * @param radius its comparison on the tail radius (null for the baseline)
     * @param headline where it ends and how it got there, without subject ("" for the baseline)
     * @param froze true when it settles tighter but ends farther than the baseline
     * @param didNotLearn its finished replicates whose final objective is above their starting objective
     * @param finished its finished replicates
     */
    public record ArmVerdict(int arm, String name, Comparison primary, Outcome outcome, Comparison radius,
            String headline, boolean froze, int didNotLearn, int finished) {
    }

    /** Wording of the primary metric's two directions. */
    private static String closer(Metric primary, boolean lower) {
        if (primary == Metric.FINAL_GAP) {
            return lower ? "closer to the minimum" : "farther from the minimum";
        }
        return lower ? "lower in training objective" : "higher in training objective";
    }

    /** @return "neither detectably closer to the minimum nor farther", or its training-objective form */
    private static String neither(Metric primary) {
        return primary == Metric.FINAL_GAP ? "neither detectably closer to the minimum nor farther"
                : "neither detectably lower nor higher in training objective";
    }

    /**
     * @param analysis the analysed study
     * @return its verdict summary
     */
    public static VerdictSummary of(StudyAnalysis analysis) {
        Study study = analysis.study();
        Metric primary = analysis.primary();
        int base = study.manifest().baselineIndex();
        List<ArmVerdict> arms = new ArrayList<>();
        for (int a = 0; a < study.armCount(); a++) {
            int finished = 0;
            int stalled = 0;
            for (Replicate r : study.replicates().get(a)) {
                if (r == null || r.diverged()) {
                    continue;
                }
                finished++;
                stalled += didNotLearn(r) ? 1 : 0;
            }
            Comparison c = analysis.comparison(primary, a);
            Comparison radius = analysis.comparison(Metric.TAIL_RADIUS, a);
            Outcome outcome = VerdictSentence.outcome(c);
            Outcome moves = VerdictSentence.outcome(radius);
            boolean froze = outcome == Outcome.HIGHER && moves == Outcome.LOWER;
            String headline = a == base ? "" : headline(primary, c, outcome, radius, moves, froze, stalled, finished);
            arms.add(new ArmVerdict(a, study.manifest().arms().get(a), c, outcome, radius, headline, froze, stalled,
                    finished));
        }
        ArmPick pick = ArmPick.of(analysis);
        String baselineNote = study.convex() ? baselineNote(study.armName(base), BallDiagnosis.of(study, base)) : "";
        int pairs = analysis.pairedReplicates().length;
        int needed = analysis.replicatesNeeded();
        String sentence = pickSentence(analysis, primary, base, pick, arms, pairs, needed, !baselineNote.isEmpty());
        return new VerdictSummary(primary, base, study.manifest().arms().get(base), List.copyOf(arms), pick, sentence,
                baselineNote, pairs, needed, analysis.classBalance() == null ? "" : analysis.classBalance().caution());
    }

    /**
     * @return what the verdict should say about a baseline that has not reached its noise ball ("" when it has, or
     *     when that cannot be told)
     */
    private static String baselineNote(String name, BallDiagnosis ball) {
        double ratio = ball.biasSq() / ball.ball();
        return switch (ball.state()) {
            case NOT_REACHED -> "The baseline " + name + " has not reached its noise ball in this budget (its remaining"
                    + " bias is " + BallDiagnosis.times(ratio) + " the ball): an arm that ends closer may only travel"
                    + " faster; train longer to compare the arms where they settle.";
            case FARTHER_THAN_THEORY -> "The baseline " + name + " ends farther from θ* than the linearised theory"
                    + " allows: it has likely not reached its noise ball; train longer to compare the arms where they"
                    + " settle.";
            case APPROACHING -> "The baseline " + name + " is still approaching its noise ball (remaining bias "
                    + BallDiagnosis.percent(Math.max(ratio, ball.tailBiasSq() / ball.tailBall())) + " of the ball):"
                    + " part of what the other arms gain may be the distance it has still to travel.";
            default -> "";
        };
    }

    /** @return true when the replicate's final objective is above its starting objective F(θ₀) */
    public static boolean didNotLearn(Replicate r) {
        double f = r.metric(Metric.FINAL_OBJECTIVE);
        return Double.isFinite(f) && Double.isFinite(r.initialObjective()) && f > r.initialObjective();
    }

    private static String headline(Metric primary, Comparison c, Outcome outcome, Comparison radius, Outcome moves,
            boolean froze, int stalled, int finished) {
        StringBuilder b = new StringBuilder();
        switch (outcome) {
            case LOWER, HIGHER -> b.append("ends ").append(VerdictSentence.size(c)).append(' ')
                    .append(closer(primary, outcome == Outcome.LOWER)).append(" (").append(VerdictSentence.detail(c))
                    .append(')');
            case NOT_COMPARED -> b.append("cannot be compared: no usable pair of replicates");
            case NO_DIFFERENCE -> {
                b.append("ends ").append(neither(primary));
                if (c.effectPairs() > 0 && c.exact().isDefined()) {
                    b.append(" (").append(VerdictSentence.detail(c));
                    if (c.zeroDifferences() > 0) {
                        b.append("; ").append(c.zeroDifferences()).append(" of ").append(c.pairs() - c.bothDiverged())
                                .append(" pairs tied");
                    }
                    if (c.testPairs() < c.pairsNeeded()) {
                        b.append("; ").append(c.pairsNeeded()).append(" untied pairs needed to detect a difference");
                    }
                    b.append(')');
                } else {
                    b.append(": ").append(VerdictSentence.render(c));
                }
            }
            case SAME -> b.append("ends where the baseline ends: ").append(VerdictSentence.render(c));
            default -> b.append("ends ").append(neither(primary)).append(": ").append(primary.words()).append(", ")
                    .append(VerdictSentence.render(c));
        }
        if (moves == Outcome.LOWER) {
            b.append(", and settles ").append(VerdictSentence.size(radius)).append(" tighter (tail radius")
                    .append(", ").append(VerdictSentence.pText(radius)).append(')');
        } else if (moves == Outcome.HIGHER) {
            b.append(", and still moves ").append(VerdictSentence.size(radius)).append(" more at the end (tail radius, ")
                    .append(VerdictSentence.pText(radius)).append(')');
        }
        if (froze) {
            b.append(": it froze before reaching the minimum, its rate fell too fast for this budget");
        }
        if (stalled > 0) {
            b.append("; ").append(stalled).append(" of ").append(finished).append(" replicates did not learn (final"
                    + " objective above the starting one)");
        }
        return b.toString();
    }

    private static String pickSentence(StudyAnalysis analysis, Metric primary, int base, ArmPick pick,
            List<ArmVerdict> arms, int pairs, int needed, boolean baselineUnsettled) {
        Study study = analysis.study();
        ArmSummary[] s = analysis.summaries(primary);
        String metric = primary.words();
        if (study.armCount() == 1) {
            return "The plan has only the baseline arm " + study.armName(base) + ": there is nothing to compare it with.";
        }
        if (s == null || arms.stream().allMatch(a -> a.primary() == null)) {
            return "No replicate index is present in every arm, so no arm can be compared with the baseline.";
        }
        if (pick.picked()) {
            int best = pick.arm();
            return "Pick " + study.armName(best) + ": among the arms whose returned iterate ends detectably "
                    + closer(primary, true) + " than the baseline " + study.armName(base) + "'s, it ends "
                    + (primary == Metric.FINAL_GAP ? "closest" : "lowest") + " (median " + metric + " "
                    + sig(s[best].median()) + " against " + sig(s[base].median()) + ").";
        }
        StringBuilder b = new StringBuilder("No arm ends detectably " + closer(primary, true) + " than the baseline "
                + study.armName(base) + " (" + metric + ", adjusted p ≤ 0.05 with an interval that agrees): keep the"
                + " baseline");
        List<String> help = new ArrayList<>();
        if (pairs < needed) {
            help.add("run at least " + needed + " replicates (this study pairs " + pairs + "; fewer cannot detect a"
                    + " difference at this number of arms)");
        }
        if (baselineUnsettled) {
            help.add("train longer: the baseline has not settled at its noise ball in this budget");
        }
        if (!help.isEmpty()) {
            b.append(", or ").append(String.join(", or ", help));
        }
        return b.append('.').toString();
    }

    /**
     * The verdict for the terminal: a heading line, one line per compared arm (its primary effect, interval,
     * adjusted p and diagnosis), the pick, and the baseline's note when it has one.
     *
     * @return the lines, without line ends
     */
    public List<String> lines() {
        List<String> out = new ArrayList<>();
        out.add("verdict (" + primary.words() + " of the returned iterate against the baseline "
                + Names.shown(baselineName) + ", "
                + pairs + " pairs):");
        int width = 0;
        for (ArmVerdict a : arms) {
            width = Math.max(width, Names.shown(a.name()).length());
        }
        width = Math.min(width, 30);
        for (ArmVerdict a : arms) {
            if (a.arm() == baseline) {
                continue;
            }
            out.add(String.format(Locale.ROOT, "  %-" + width + "s  %s", Names.shown(a.name()), a.headline()));
        }
        out.add((pick.picked() ? "" : "pick: none. ") + pickSentence);
        if (!baselineNote.isEmpty()) {
            out.add(baselineNote);
        }
        if (!classCaution.isEmpty()) {
            out.add("warning: " + classCaution);
        }
        return out;
    }

    /**
     * Writes the verdict as JSON fields of the object the generator is in: {@code primary_metric}, {@code baseline},
     * {@code pick} (the arm's name, or null), {@code pick_sentence}, {@code arms} [{@code name}, {@code outcome}
     * (lower, higher, same, no-difference, unclear, not-compared), {@code effect} and {@code unit}, {@code ci_low},
     * {@code ci_high}, {@code ci_level}, {@code p_adjusted}, {@code froze}, {@code did_not_learn}, {@code headline}].
     *
     * @param g the generator, inside an object
     */
    public void writeJsonFields(JsonGenerator g) throws IOException {
        g.writeStringField("primary_metric", primary.key());
        g.writeStringField("baseline", baselineName);
        if (pick.picked()) {
            g.writeStringField("pick", arms.get(pick.arm()).name());
        } else {
            g.writeNullField("pick");
        }
        g.writeStringField("pick_sentence", pickSentence);
        settle.reports.format.JsonOut.text(g, "class_caution", classCaution.isEmpty() ? null : classCaution);
        g.writeArrayFieldStart("arms");
        for (ArmVerdict a : arms) {
            if (a.arm() == baseline) {
                continue;
            }
            g.writeStartObject();
            g.writeStringField("name", a.name());
            g.writeStringField("outcome", a.outcome().name().toLowerCase(Locale.ROOT).replace('_', '-'));
            Comparison c = a.primary();
            boolean effect = c != null && c.effectPairs() > 0;
            number(g, "effect", effect ? c.change() : Double.NaN);
            g.writeStringField("unit", c == null ? "%" : c.scale().unit());
            number(g, "ci_low", effect && c.exact().isDefined() ? c.scale().shown(c.exact().low()) : Double.NaN);
            number(g, "ci_high", effect && c.exact().isDefined() ? c.scale().shown(c.exact().high()) : Double.NaN);
            number(g, "ci_level", c == null ? Double.NaN : c.level());
            number(g, "p_adjusted", c == null ? Double.NaN : c.pAdjusted());
            g.writeBooleanField("froze", a.froze());
            g.writeNumberField("did_not_learn", a.didNotLearn());
            g.writeStringField("headline", a.headline());
            g.writeEndObject();
        }
        g.writeEndArray();
    }

    private static void number(JsonGenerator g, String key, double v) throws IOException {
        if (Double.isFinite(v)) {
            g.writeNumberField(key, v);
        } else {
            g.writeNullField(key);
        }
    }

    private static String sig(double v) {
        return Format.sig(v);
    }
}
