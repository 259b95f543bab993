package settle.reports.metrics;

import java.util.ArrayList;
import java.util.List;
import settle.reports.format.Nudge;
import settle.reports.format.NudgeRecord;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * The nudges of every arm, as the rate and objective charts mark them and the nudge table lists them. An arm's
 * nudges are the rows of {@code nudges.csv} for it when it has any there (they carry the rate and the time);
 * otherwise those its replicate files record (nudges fixed in the plan, such as a replay), taken from its replicate
 * with the most nudges (a nudge is recorded by every replicate that reached its epoch), with the rate read from that
 * replicate's rates.
 */
public final class ArmNudges {

    /**
     * One nudge of an arm.
     *
     * @param arm the arm (0-based)
     * @param fromEpoch the first epoch at the new rate
     * @param factor the multiplier
     * @param rate the rate at the first update of {@code fromEpoch} with the nudge in force (NaN when unknown)
     * @param note its note ("" when none)
     * @param time when it was applied, or "" for a nudge fixed in the plan
     */
    public record Mark(int arm, int fromEpoch, double factor, double rate, String note, String time) {
    }

    private ArmNudges() {
    }

    /**
     * @param study the study
     * @return per arm (by arm index), its nudges in the order applied; empty lists when none
     */
    public static List<List<Mark>> of(Study study) {
        int arms = study.armCount();
        int perEpoch = Math.max(1, study.manifest().updatesPerEpoch());
        List<List<Mark>> out = new ArrayList<>();
        for (int a = 0; a < arms; a++) {
            List<Mark> marks = new ArrayList<>();
            // by name, as the runner replays them: nudges.csv records the arm's index when it was nudged, and a
            // study that grew since may have moved the arm
            String name = study.manifest().arms().get(a);
            for (NudgeRecord r : study.nudgeLog()) {
                if (r.arm().equals(name)) {
                    marks.add(new Mark(a, r.fromEpoch(), r.factor(), r.rate(), r.note(), r.time()));
                }
            }
            if (marks.isEmpty()) {
                Replicate longest = null;
                for (Replicate r : study.replicates().get(a)) {
                    if (r != null && (longest == null || r.nudges().size() > longest.nudges().size())) {
                        longest = r;
                    }
                }
                if (longest != null) {
                    for (Nudge n : longest.nudges()) {
                        long first = (long) (n.fromEpoch() - 1) * perEpoch;
                        double rate = first < longest.rates().length ? longest.rates()[(int) first] : Double.NaN;
                        marks.add(new Mark(a, n.fromEpoch(), n.factor(), rate, n.note(), ""));
                    }
                }
            }
            out.add(marks);
        }
        return out;
    }

    /** @return the number of nudges over every arm of {@code nudges} */
    public static int count(List<List<Mark>> nudges) {
        int count = 0;
        for (List<Mark> arm : nudges) {
            count += arm.size();
        }
        return count;
    }
}
