package settle.reports.metrics;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import settle.reports.stats.Quantiles;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * Where a plateau schedule cut an arm's rate, over its present replicates (finished or diverged): how many cuts each
 * replicate had, and the epoch of each cut replicate's first cut.
 *
 * @param cuts the number of cuts of each present replicate, sorted ascending
 * @param firstCuts the first epoch at a reduced rate of each replicate that was cut, sorted ascending
 */
public record PlateauSummary(double[] cuts, double[] firstCuts) {

    /**
     * @param cuts kept, not copied; sorted
     * @param firstCuts kept, not copied; sorted
     */
    public PlateauSummary {
        if (firstCuts.length > cuts.length) {
            throw new IllegalArgumentException(firstCuts.length + " first cuts for " + cuts.length + " replicates");
        }
    }

    /**
     * @param study the study
     * @param arm the arm (0-based)
     * @return the arm's cuts
     */
    public static PlateauSummary of(Study study, int arm) {
        List<Double> cuts = new ArrayList<>();
        List<Double> first = new ArrayList<>();
        for (Replicate r : study.replicates().get(arm)) {
            if (r == null) {
                continue;
            }
            cuts.add((double) r.plateauCuts().size());
            if (!r.plateauCuts().isEmpty()) {
                first.add((double) r.plateauCuts().get(0).fromEpoch());
            }
        }
        return new PlateauSummary(sorted(cuts), sorted(first));
    }

    /** @return the number of present replicates */
    public int replicates() {
        return cuts.length;
    }

    /** @return the replicates never cut */
    public int neverCut() {
        return cuts.length - firstCuts.length;
    }

    /** @return the type-7 median of the number of cuts (NaN without replicates) */
    public double medianCuts() {
        return cuts.length == 0 ? Double.NaN : Quantiles.type7(cuts, 0.5);
    }

    /** @return the type-7 median of the first cut's epoch over the replicates cut (NaN when none was) */
    public double medianFirstCut() {
        return firstCuts.length == 0 ? Double.NaN : Quantiles.type7(firstCuts, 0.5);
    }

    /** @return the values in a new array, sorted ascending */
    private static double[] sorted(List<Double> values) {
        double[] out = new double[values.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = values.get(i);
        }
        Arrays.sort(out);
        return out;
    }
}
