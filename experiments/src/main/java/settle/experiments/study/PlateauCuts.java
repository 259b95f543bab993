package settle.experiments.study;

import java.util.ArrayList;
import java.util.List;
import settle.engine.schedule.RateDriver;
import settle.engine.schedule.RunShape;
import settle.engine.schedule.Schedule;
import settle.engine.train.EpochRecord;
import settle.engine.train.ReplicateResult;

/**
 * Where a plateau schedule cut one replicate's rate. The plateau driver decides from the epoch-end losses
 * alone, so feeding a fresh driver the replicate's recorded losses repeats its decisions exactly; a cut is an
 * epoch whose first-update rate, relative to the no-cut envelope (which carries the same warmup), is below
 * the previous epoch's.
 */
public final class PlateauCuts {

    /** Relative drop of the rate-to-envelope ratio that counts as a cut (not rounding). */
    private static final double RELATIVE_DROP = 1e-9;

    /**
     * A cut: the reduced rate applies from epoch {@code fromEpoch} on.
     *
     * @param rate the rate the replicate used at the first update of that epoch (nudges included), or NaN
     *     when it stopped before that update
     */
    public record Cut(int fromEpoch, double rate) {
    }

    private PlateauCuts() {
    }

    /**
     * @param schedule the arm's schedule as planned (without nudges)
     * @return the cuts, in epoch order; empty for every kind but plateau
     */
    public static List<Cut> of(Schedule schedule, RunShape shape, ReplicateResult result) {
        if (!"plateau".equals(schedule.kind())) {
            return List.of();
        }
        double[] envelope = schedule.plannedRates(shape);
        List<EpochRecord> epochs = result.epochs();
        double[] rates = result.rates();
        RateDriver driver = schedule.start(shape);
        int last = Math.min(shape.epochs(), epochs.size() + 1);
        List<Cut> cuts = new ArrayList<>();
        double previous = Double.NaN;
        long update = 1;
        for (int e = 1; e <= last; e++) {
            long first = update;
            double firstRate = Double.NaN;
            for (int i = 0; i < shape.updatesPerEpoch(); i++) {
                double r = driver.rate(e, update);
                if (i == 0) {
                    firstRate = r;
                }
                update++;
            }
            double planned = envelope[(int) (first - 1)];
            double ratio = planned > 0 ? firstRate / planned : 1.0;
            if (e > 1 && ratio < previous * (1 - RELATIVE_DROP)) {
                cuts.add(new Cut(e, first <= rates.length ? rates[(int) (first - 1)] : Double.NaN));
            }
            previous = ratio;
            if (e <= epochs.size()) {
                EpochRecord rec = epochs.get(e - 1);
                driver.epochEnded(e, rec.objective(), rec.holdoutLoss());
            }
        }
        return cuts;
    }
}
