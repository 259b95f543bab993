package settle.reports.metrics;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * The tail cloud: every arm's tail snapshots projected onto the two principal axes of all arms' snapshots pooled,
 * so that the clouds share their axes and their sizes compare directly.
 *
 * <p>Per arm at most {@value #POINTS_PER_ARM} snapshots are taken, evenly over its finished replicates that recorded
 * snapshots (⌊{@value #POINTS_PER_ARM} / replicates⌋ each, at least 1, evenly spaced over the replicate's rows); a
 * snapshot with a value that is not finite is left out. The axes are the eigenvectors of the two largest eigenvalues
 * of the pooled covariance (divisor: the number of points), each signed so that its largest component is positive.
 *
 * @param unavailable why the snapshots could not be projected (fewer than two finite snapshots, or a spread too
 *     large to compute), or null when they were
 * @param centre the mean of the pooled snapshots (P values)
 * @param first the first principal axis (unit length), empty when unavailable
 * @param second the second principal axis, empty when unavailable
 * @param firstShare the first axis's share of the total variance, in % (0 when the variance is 0)
 * @param secondShare the second axis's share, in %
 * @param points per arm (by arm index), its snapshots projected: {x, y} pairs on the first and second axes; empty
 *     lists when unavailable
 * @param star θ* projected the same way, or null for a model without a reference minimiser (or when unavailable)
 */
public record TailCloud(String unavailable, double[] centre, double[] first, double[] second, double firstShare,
        double secondShare, List<double[][]> points, double[] star) {

    /** Largest model whose tail cloud is drawn. */
    public static final int MAX_PARAMETERS = 200;
    /** Most snapshots taken per arm. */
    public static final int POINTS_PER_ARM = 300;

    /**
     * @param points kept as an unmodifiable copy of the list (the arrays are not copied)
     */
    public TailCloud {
        points = List.copyOf(points);
    }

    /**
     * @param study the study
     * @return why the tail cloud is not drawn at all (the model is too large or too small, or no replicate recorded
     *     snapshots), or null when it is
     */
    public static String skipReason(Study study) {
        int p = study.manifest().parameters();
        if (p > MAX_PARAMETERS) {
            return "the model has " + p + " parameters; the tail cloud is drawn for models of up to " + MAX_PARAMETERS;
        }
        if (p < 2) {
            return "the model has fewer than two parameters";
        }
        for (int a = 0; a < study.armCount(); a++) {
            for (Replicate r : study.replicates().get(a)) {
                if (r != null && r.snapshots() != null) {
                    return null;
                }
            }
        }
        return "no replicate recorded tail snapshots";
    }

    /**
     * Projects the snapshots of a study for which {@link #skipReason} is null.
     *
     * @param study the study
     * @return the projected cloud, or one that says why it is unavailable
     */
    public static TailCloud of(Study study) {
        int arms = study.armCount();
        int p = study.manifest().parameters();
        List<List<double[]>> chosen = new ArrayList<>();
        for (int a = 0; a < arms; a++) {
            chosen.add(chosen(study, a, p));
        }
        double[] mean = new double[p];
        int total = 0;
        for (List<double[]> pts : chosen) {
            for (double[] v : pts) {
                for (int j = 0; j < p; j++) {
                    mean[j] += v[j];
                }
                total++;
            }
        }
        for (int j = 0; j < p; j++) {
            mean[j] /= total;
        }
        double[][] cov = new double[p][p];
        for (List<double[]> pts : chosen) {
            for (double[] v : pts) {
                for (int i = 0; i < p; i++) {
                    double di = v[i] - mean[i];
                    for (int j = i; j < p; j++) {
                        cov[i][j] += di * (v[j] - mean[j]);
                    }
                }
            }
        }
        double trace = 0;
        for (int i = 0; i < p; i++) {
            for (int j = i; j < p; j++) {
                cov[i][j] /= total;
                cov[j][i] = cov[i][j];
            }
            trace += cov[i][i];
        }
        if (total < 2 || !Double.isFinite(trace)) {
            return new TailCloud(total < 2 ? "fewer than two tail snapshots have finite values"
                    : "the tail snapshots are too far apart for their spread to be computed", mean, new double[0],
                    new double[0], 0, 0, List.of(), null);
        }
        EigenDecomposition eig = new EigenDecomposition(new Array2DRowRealMatrix(cov, false));
        double[] values = eig.getRealEigenvalues();
        Integer[] order = new Integer[p];
        for (int i = 0; i < p; i++) {
            order[i] = i;
        }
        Arrays.sort(order, (i, j) -> Double.compare(values[j], values[i]));
        double[] u = eig.getEigenvector(order[0]).toArray();
        double[] v = eig.getEigenvector(order[1]).toArray();
        signFix(u);
        signFix(v);
        double share1 = trace > 0 ? 100 * values[order[0]] / trace : 0;
        double share2 = trace > 0 ? 100 * values[order[1]] / trace : 0;
        List<double[][]> projected = new ArrayList<>();
        for (List<double[]> pts : chosen) {
            double[][] xy = new double[pts.size()][];
            for (int i = 0; i < xy.length; i++) {
                xy[i] = project(pts.get(i), mean, u, v);
            }
            projected.add(xy);
        }
        double[] star = study.convex() && study.reference().theta().length == p
                ? project(study.reference().theta(), mean, u, v) : null;
        return new TailCloud(null, mean, u, v, share1, share2, projected, star);
    }

    /** @return the snapshots taken of arm a: at most {@link #POINTS_PER_ARM}, evenly over its replicates */
    private static List<double[]> chosen(Study study, int a, int p) {
        List<Replicate> reps = new ArrayList<>();
        for (Replicate r : study.replicates().get(a)) {
            if (r != null && !r.diverged() && r.snapshots() != null) {
                reps.add(r);
            }
        }
        List<double[]> points = new ArrayList<>();
        int per = reps.isEmpty() ? 0 : Math.max(1, POINTS_PER_ARM / reps.size());
        for (Replicate r : reps) {
            int k = r.snapshotRows();
            int take = Math.min(per, k);
            for (int j = 0; j < take; j++) {
                int row = (int) ((long) j * k / take);
                double[] point = Arrays.copyOfRange(r.snapshots(), row * p, (row + 1) * p);
                if (Arrays.stream(point).allMatch(Double::isFinite)) {
                    points.add(point);
                }
            }
        }
        return points;
    }

    /** Flips e, in place, so that its component of largest magnitude (the first on a tie) is positive. */
    static void signFix(double[] e) {
        int big = 0;
        for (int i = 1; i < e.length; i++) {
            if (Math.abs(e[i]) > Math.abs(e[big])) {
                big = i;
            }
        }
        if (e[big] < 0) {
            for (int i = 0; i < e.length; i++) {
                e[i] = -e[i];
            }
        }
    }

    /** @return x − mean projected on u and v: {(x − mean)·u, (x − mean)·v} */
    static double[] project(double[] x, double[] mean, double[] u, double[] v) {
        double a = 0;
        double b = 0;
        for (int j = 0; j < x.length; j++) {
            double d = x[j] - mean[j];
            a += d * u[j];
            b += d * v[j];
        }
        return new double[] {a, b};
    }

    /** @return true when the snapshots were projected */
    public boolean available() {
        return unavailable == null;
    }
}
