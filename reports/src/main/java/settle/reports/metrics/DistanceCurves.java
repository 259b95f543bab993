package settle.reports.metrics;

import settle.reports.format.Prediction;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * An arm's measured and predicted squared distance to θ* at each epoch end, over its finished replicates: the
 * measured curve is the mean of ‖θ − θ*‖² (the replicate files' {@code epochs.distance}, squared), the predicted
 * one the mean of the predictions' {@code epoch_distance_sq}; each a mean of the finite values at that epoch, NaN
 * where there is none. The predicted curve stops before {@link #unstableEpoch()}: from there the prediction has no
 * numbers.
 *
 * @param measured the measured mean ‖θ − θ*‖² at each epoch end (index 0 = epoch 1)
 * @param predicted the predicted E‖θ − θ*‖² at each epoch end, NaN from the unstable epoch on
 * @param unstableEpoch the first epoch (from 1) at which some replicate's prediction is unstable, 0 when every
 *     prediction is stable
 */
public record DistanceCurves(double[] measured, double[] predicted, int unstableEpoch) {

    /**
     * @param measured kept, not copied
     * @param predicted kept, not copied
     * @param unstableEpoch the first unstable epoch, or 0
     * @throws IllegalArgumentException when the two curves differ in length
     */
    public DistanceCurves {
        if (measured.length != predicted.length) {
            throw new IllegalArgumentException("one value per epoch in both curves: " + measured.length + " measured, "
                    + predicted.length + " predicted");
        }
    }

    /**
     * @param study the study
     * @param arm the arm (0-based)
     * @return the arm's curves over as many epochs as its longest finished replicate
     */
    public static DistanceCurves of(Study study, int arm) {
        int epochs = 0;
        for (Replicate r : study.replicates().get(arm)) {
            if (r != null && !r.diverged()) {
                epochs = Math.max(epochs, r.epochs().size());
            }
        }
        int unstable = unstableEpoch(study, arm);
        int predictedEpochs = unstable > 0 ? Math.min(epochs, unstable - 1) : epochs;
        double[] measured = new double[epochs];
        double[] predicted = new double[epochs];
        int[] nm = new int[epochs];
        int[] np = new int[epochs];
        for (Replicate r : study.replicates().get(arm)) {
            if (r == null || r.diverged()) {
                continue;
            }
            double[] d = r.epochs().distance();
            for (int e = 0; e < d.length; e++) {
                double sq = d[e] * d[e];
                if (Double.isFinite(sq)) {
                    measured[e] += sq;
                    nm[e]++;
                }
            }
            Prediction p = r.prediction();
            if (p.predicted() && p.epochDistanceSq() != null) {
                double[] s = p.epochDistanceSq();
                for (int e = 0; e < Math.min(predictedEpochs, s.length); e++) {
                    if (Double.isFinite(s[e])) {
                        predicted[e] += s[e];
                        np[e]++;
                    }
                }
            }
        }
        for (int e = 0; e < epochs; e++) {
            measured[e] = nm[e] == 0 || !Double.isFinite(measured[e]) ? Double.NaN : measured[e] / nm[e];
            predicted[e] = np[e] == 0 || !Double.isFinite(predicted[e]) ? Double.NaN : predicted[e] / np[e];
        }
        return new DistanceCurves(measured, predicted, unstable);
    }

    /**
     * @param study the study
     * @param arm the arm (0-based)
     * @return the first epoch (from 1) at which some finished replicate of the arm has an unstable prediction, or 0
     *     when every prediction is stable
     */
    public static int unstableEpoch(Study study, int arm) {
        int first = 0;
        for (Replicate r : study.replicates().get(arm)) {
            if (r == null || r.diverged() || !r.prediction().predicted()) {
                continue;
            }
            int e = r.prediction().unstableEpoch(study.manifest().updatesPerEpoch());
            if (e > 0 && (first == 0 || e < first)) {
                first = e;
            }
        }
        return first;
    }

    /** @return the number of epochs the curves cover */
    public int epochs() {
        return measured.length;
    }
}
