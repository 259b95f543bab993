package settle.reports.html;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import settle.reports.study.Nudge;
import settle.reports.study.NudgeRecord;
import settle.reports.study.Replicate;
import settle.reports.study.Study;

/** The nudges and plateau cuts of a study, as the charts and tables mark them. */
final class Marks {

    /**
     * One nudge of an arm.
     *
     * @param arm the arm (0-based)
     * @param fromEpoch the first epoch at the new rate
     * @param factor the multiplier
     * @param rate the rate at the first update of {@code fromEpoch} with the nudge in force (NaN when unknown)
     * @param note its note
     * @param time when it was applied, or "" for a nudge fixed in the plan
     */
    record NudgeMark(int arm, int fromEpoch, double factor, double rate, String note, String time) {

        /** @return the marker's tooltip */
        String tooltip(String armName) {
            return armName + ": rate × " + Format.sig(factor) + " from epoch " + fromEpoch
                    + (Double.isFinite(rate) ? " (rate " + Format.sig(rate) + ")" : "")
                    + (note.isEmpty() ? "" : " — " + note);
        }

        /** @return the marker's label */
        String label() {
            return "×" + Format.sig(factor);
        }
    }

    private Marks() {
    }

    /**
     * Per arm, its nudges: the rows of {@code nudges.csv} for the arm when it has any (they carry the rate and the
     * time), else those its replicate files record (the longest list among its replicates: a nudge is recorded by
     * every replicate that reached its epoch), with the rate read from that replicate's rates.
     */
    static List<List<NudgeMark>> nudges(Study study) {
        int arms = study.armCount();
        int perEpoch = Math.max(1, study.manifest().updatesPerEpoch());
        List<List<NudgeMark>> out = new ArrayList<>();
        for (int a = 0; a < arms; a++) {
            List<NudgeMark> marks = new ArrayList<>();
            for (NudgeRecord r : study.nudgeLog()) {
                if (r.armIndex() == a + 1) {
                    marks.add(new NudgeMark(a, r.fromEpoch(), r.factor(), r.rate(), r.note(), r.time()));
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
                        marks.add(new NudgeMark(a, n.fromEpoch(), n.factor(), rate, n.note(), ""));
                    }
                }
            }
            out.add(marks);
        }
        return out;
    }

    /** @return true when some replicate of arm a had its rate cut by a plateau schedule */
    static boolean cut(Study study, int a) {
        for (Replicate r : study.replicates().get(a)) {
            if (r != null && !r.plateauCuts().isEmpty()) {
                return true;
            }
        }
        return false;
    }

    /** @return a cut's tooltip */
    static String cutTooltip(String armName, Replicate r, int fromEpoch, double rate) {
        return String.format(Locale.ROOT, "%s, replicate %d: rate cut from epoch %d", armName, r.replicate(),
                fromEpoch) + (Double.isFinite(rate) ? " to " + Format.sig(rate) : "");
    }
}
