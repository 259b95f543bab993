package settle.reports.compare;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import settle.reports.format.Metric;
import settle.reports.stats.VerdictSentence.Outcome;
import settle.reports.text.Names;

/**
 * Several studies side by side: arms matched by name across studies, each arm's primary effect against its own
 * study's baseline, study by study. Nothing is pooled: a study's effect, interval and adjusted p are its own verdict's
 * (docs/stats.md, "Across studies"), and the summary counts the studies where the arm ends detectably closer, detectably
 * farther, or neither.
 *
 * <p>Studies are mixed only when they share the baseline arm's name and the primary metric (final gap for convex
 * models, final training objective otherwise): an effect against another baseline, or on another metric, measures
 * something else. Each such set of studies is a {@link Group}, in the order its first study was given; the first group
 * holds the first study.
 *
 * @param studies every study, in the order given
 * @param labels each study's label, by the same index: its name, with its directory when two studies share a name
 * @param groups the studies grouped by baseline and primary metric
 */
public record CrossStudy(List<StudyDigest> studies, List<String> labels, List<Group> groups) {

    public CrossStudy {
        studies = List.copyOf(studies);
        labels = List.copyOf(labels);
        groups = List.copyOf(groups);
    }

    /**
     * Studies that share a baseline and a primary metric.
     *
     * @param baseline the baseline arm's name as recorded
     * @param primary the primary metric
     * @param studies the indices of its studies (into {@link CrossStudy#studies}), in the order given
     * @param arms the arms (other than the baseline) present in two or more of its studies, in order of first
     *     appearance
     * @param single the arms present in one of its studies only, with that study's index
     * @param why why this group is kept apart from the first group ("" for the first group)
     */
    public record Group(String baseline, Metric primary, List<Integer> studies, List<SharedArm> arms,
            Map<String, Integer> single, String why) {

        public Group {
            studies = List.copyOf(studies);
            arms = List.copyOf(arms);
            single = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(single));
        }
    }

    /**
     * An arm present in several studies of a group.
     *
     * @param name the arm's name as recorded
     * @param rows one per study holding it, in the order given
     * @param closer studies where it ends detectably closer than the baseline (lower primary metric)
     * @param farther studies where it ends detectably farther
     * @param undecided the others (no difference detected, the test and interval disagree, tied, or not compared)
     * @param picked studies that pick it
     * @param sentence the summary in plain words
     */
    public record SharedArm(String name, List<Row> rows, int closer, int farther, int undecided, int picked,
            String sentence) {

        public SharedArm {
            rows = List.copyOf(rows);
        }
    }

    /**
     * One study's line of a shared arm.
     *
     * @param study the study's index (into {@link CrossStudy#studies})
     * @param effect the arm's primary effect in that study
     */
    public record Row(int study, StudyDigest.ArmEffect effect) {
    }

    /**
     * @param studies the digests, in the order given (two or more, as the caller checks)
     * @return them side by side
     */
    public static CrossStudy of(List<StudyDigest> studies) {
        List<String> labels = labels(studies);
        Map<String, List<Integer>> byKey = new LinkedHashMap<>();
        for (int s = 0; s < studies.size(); s++) {
            StudyDigest d = studies.get(s);
            byKey.computeIfAbsent(d.primary().key() + "\u0000" + d.baseline(), k -> new ArrayList<>()).add(s);
        }
        List<Group> groups = new ArrayList<>();
        StudyDigest first = studies.get(0);
        for (List<Integer> members : byKey.values()) {
            StudyDigest lead = studies.get(members.get(0));
            Map<String, List<Integer>> holders = new LinkedHashMap<>();
            for (int s : members) {
                for (StudyDigest.ArmEffect a : studies.get(s).arms()) {
                    holders.computeIfAbsent(a.name(), k -> new ArrayList<>()).add(s);
                }
            }
            List<SharedArm> arms = new ArrayList<>();
            Map<String, Integer> single = new LinkedHashMap<>();
            for (Map.Entry<String, List<Integer>> e : holders.entrySet()) {
                if (e.getValue().size() < 2) {
                    single.put(e.getKey(), e.getValue().get(0));
                    continue;
                }
                arms.add(shared(e.getKey(), lead.baseline(), lead.primary(), studies, e.getValue()));
            }
            String why = groups.isEmpty() ? "" : why(lead, first);
            groups.add(new Group(lead.baseline(), lead.primary(), members, arms, single, why));
        }
        return new CrossStudy(studies, labels, groups);
    }

    private static SharedArm shared(String name, String baseline, Metric primary, List<StudyDigest> studies,
            List<Integer> holders) {
        List<Row> rows = new ArrayList<>();
        int closer = 0;
        int farther = 0;
        int picked = 0;
        for (int s : holders) {
            StudyDigest.ArmEffect a = studies.get(s).arm(name);
            rows.add(new Row(s, a));
            if (a.outcome() == Outcome.LOWER) {
                closer++;
            } else if (a.outcome() == Outcome.HIGHER) {
                farther++;
            }
            picked += a.picked() ? 1 : 0;
        }
        int undecided = rows.size() - closer - farther;
        return new SharedArm(name, rows, closer, farther, undecided, picked,
                sentence(name, baseline, primary, rows.size(), closer, farther, undecided, picked));
    }

    /**
     * The summary of one arm: "cosine ends closer to the minimum than constant in 5 of 6 studies, farther in none;
     * the other 1 undecided; picked in 4" (the picks said only when there are any).
     */
    static String sentence(String arm, String baseline, Metric primary, int studies, int closer, int farther,
            int undecided, int picked) {
        boolean gap = primary == Metric.FINAL_GAP;
        String better = gap ? "closer to the minimum" : "lower in training objective";
        String worse = gap ? "farther" : "higher";
        StringBuilder b = new StringBuilder(Names.shown(arm)).append(" ends ");
        if (closer == 0 && farther == 0) {
            b.append(gap ? "neither detectably closer to the minimum nor farther"
                    : "neither detectably lower nor higher in training objective").append(" than ")
                    .append(Names.shown(baseline)).append(" in ").append(studies == 2 ? "either of the 2 studies"
                            : "any of the " + studies + " studies");
        } else {
            b.append(better).append(" than ").append(Names.shown(baseline)).append(" in ").append(times(closer))
                    .append(" of ").append(studies).append(" studies, ").append(worse).append(" in ")
                    .append(times(farther));
            if (undecided > 0) {
                b.append("; the other ").append(undecided).append(" undecided");
            }
        }
        if (picked > 0) {
            b.append("; picked in ").append(picked);
        }
        b.append('.');
        return b.toString();
    }

    private static String times(int n) {
        return n == 0 ? "none" : Integer.toString(n);
    }

    /** @return why a group is not mixed with the first group */
    private static String why(StudyDigest lead, StudyDigest first) {
        List<String> parts = new ArrayList<>();
        if (!lead.baseline().equals(first.baseline())) {
            parts.add("their baseline is " + Names.shown(lead.baseline()) + ", not " + Names.shown(first.baseline()));
        }
        if (lead.primary() != first.primary()) {
            parts.add("their primary metric is the " + lead.primary().words() + ", not the " + first.primary().words()
                    + (lead.primary() == Metric.FINAL_OBJECTIVE ? " (a model without a reference minimiser)"
                            : " (convex models with a reference minimiser)"));
        }
        return "Shown apart, not mixed with the first group: " + String.join(", and ", parts)
                + "; an effect against another baseline or on another metric measures something else.";
    }

    /** @return each study's label: its name, or "name (directory)" when several studies share the name */
    private static List<String> labels(List<StudyDigest> studies) {
        Map<String, Integer> names = new HashMap<>();
        for (StudyDigest d : studies) {
            names.merge(d.name(), 1, Integer::sum);
        }
        List<String> labels = new ArrayList<>();
        for (StudyDigest d : studies) {
            labels.add(names.get(d.name()) == 1 ? d.name() : d.name() + " (" + d.directory() + ")");
        }
        return labels;
    }

    /** @return the number of arm names present in two or more studies of one group, over every group */
    public int sharedArms() {
        return groups.stream().mapToInt(g -> g.arms().size()).sum();
    }
}
