package settle.engine.minimum;

import org.ejml.data.DMatrixRMaj;
import settle.engine.model.Model;

/**
 * The gauge of a logistic model: the directions along which the objective is flat by symmetry, and an
 * orthonormal basis B of the gauge-free subspace they leave (DESIGN.md "Training semantics").
 *
 * <p>Multinomial softmax is unchanged when a constant is added to every class bias; with λ = 0 also when a
 * vector is added to every class's weight vector. Each such symmetry ties a group of K parameters (the K
 * biases, or the K class weights of one feature); the gauge-free subspace centres every group. A binary model
 * has no gauge. With a penalty on the biases ({@link Minimiser#withBiasPenalty}) the bias group is no gauge.
 *
 * <p>Reduced coordinates (the coordinates in B): first the parameters outside every group, in index order,
 * then for each group the K − 1 Helmert coordinates r_m = (v_0 + … + v_(m−1) − m·v_m)/√(m(m+1)), m = 1..K−1
 * (an orthonormal basis of the centred vectors, common practice).
 */
public final class GaugeBasis {

    private final int parameters;
    private final int[] loose;
    private final int[][] groups;

    private GaugeBasis(int parameters, int[] loose, int[][] groups) {
        this.parameters = parameters;
        this.loose = loose;
        this.groups = groups;
    }

    /**
     * The gauge DESIGN.md defines for a logistic model: class biases always (softmax), class weights when λ = 0.
     *
     * @throws IllegalArgumentException when the model is not logistic
     */
    public static GaugeBasis of(Model model) {
        return of(Layout.of(model), model.l2(), 0.0);
    }

    static GaugeBasis of(Layout layout, double l2, double biasPenalty) {
        int d = layout.inputs;
        int k = layout.classes;
        if (layout.binary) {
            return new GaugeBasis(layout.parameters, identity(layout.parameters), new int[0][]);
        }
        boolean weights = l2 == 0.0;
        boolean biases = biasPenalty == 0.0;
        int groupCount = (weights ? d : 0) + (biases ? 1 : 0);
        int[][] groups = new int[groupCount][];
        boolean[] grouped = new boolean[layout.parameters];
        int g = 0;
        for (int j = 0; j <= d; j++) {
            boolean tied = j < d ? weights : biases;
            if (!tied) {
                continue;
            }
            int[] group = new int[k];
            for (int u = 0; u < k; u++) {
                group[u] = layout.index(u, j);
                grouped[group[u]] = true;
            }
            groups[g++] = group;
        }
        int[] loose = new int[layout.parameters - groupCount * k];
        int l = 0;
        for (int i = 0; i < layout.parameters; i++) {
            if (!grouped[i]) {
                loose[l++] = i;
            }
        }
        return new GaugeBasis(layout.parameters, loose, groups);
    }

    private static int[] identity(int n) {
        int[] a = new int[n];
        for (int i = 0; i < n; i++) {
            a[i] = i;
        }
        return a;
    }

    /** @return P, the length of θ */
    public int parameterCount() {
        return parameters;
    }

    /** @return the number of gauge (null) directions, 0 for a binary model */
    public int dimension() {
        return groups.length;
    }

    /** @return the dimension of the gauge-free subspace, P minus {@link #dimension()} */
    public int freeDimension() {
        return parameters - groups.length;
    }

    /**
     * Projects onto the gauge-free subspace: centres every group.
     *
     * @param theta P values; modified
     */
    public void project(double[] theta) {
        for (int[] group : groups) {
            double mean = 0;
            for (int index : group) {
                mean += theta[index];
            }
            mean /= group.length;
            for (int index : group) {
                theta[index] -= mean;
            }
        }
    }

    /**
     * Reduced coordinates Bᵀv of a full vector.
     *
     * @param full P values from {@code offset}; not modified
     * @param reduced receives {@link #freeDimension()} values from position 0; modified
     */
    public void reduce(double[] full, int offset, double[] reduced) {
        int r = 0;
        for (int index : loose) {
            reduced[r++] = full[offset + index];
        }
        for (int[] group : groups) {
            double prefix = full[offset + group[0]];
            for (int m = 1; m < group.length; m++) {
                double v = full[offset + group[m]];
                reduced[r++] = (prefix - m * v) / Math.sqrt(m * (m + 1.0));
                prefix += v;
            }
        }
    }

    /**
     * The full vector B·r of reduced coordinates; the result lies in the gauge-free subspace.
     *
     * @param reduced {@link #freeDimension()} values; not modified
     * @param full receives P values; modified
     */
    public void expand(double[] reduced, double[] full) {
        int r = 0;
        for (int index : loose) {
            full[index] = reduced[r++];
        }
        for (int[] group : groups) {
            int k = group.length;
            // full[group[j]] = −j·r_j/√(j(j+1)) + Σ_{m>j} r_m/√(m(m+1)), with r_m = reduced[r + m − 1]
            double suffix = 0;
            for (int j = k - 1; j >= 0; j--) {
                double own = j == 0 ? 0.0 : -j * reduced[r + j - 1] / Math.sqrt(j * (j + 1.0));
                full[group[j]] = own + suffix;
                if (j >= 1) {
                    suffix += reduced[r + j - 1] / Math.sqrt(j * (j + 1.0));
                }
            }
            r += k - 1;
        }
    }

    /**
     * @param m a symmetric P×P matrix; not modified
     * @return Bᵀ·m·B, the matrix in reduced coordinates
     */
    public DMatrixRMaj reduce(DMatrixRMaj m) {
        int p = parameters;
        int f = freeDimension();
        if (m.numRows != p || m.numCols != p) {
            throw new IllegalArgumentException("expected a " + p + "×" + p + " matrix, got " + m.numRows + "×" + m.numCols);
        }
        // T = m·B: row i of T is Bᵀ applied to row i of m. Stored transposed (f × p) so the second pass
        // (Tᵀ·B, which equals Bᵀ·m·B by symmetry) again reads rows.
        double[] row = new double[f];
        DMatrixRMaj tt = new DMatrixRMaj(f, p);
        for (int i = 0; i < p; i++) {
            reduce(m.data, i * p, row);
            for (int c = 0; c < f; c++) {
                tt.data[c * p + i] = row[c];
            }
        }
        DMatrixRMaj out = new DMatrixRMaj(f, f);
        for (int c = 0; c < f; c++) {
            reduce(tt.data, c * p, row);
            System.arraycopy(row, 0, out.data, c * f, f);
        }
        // symmetrise against rounding
        for (int a = 0; a < f; a++) {
            for (int b = a + 1; b < f; b++) {
                double s = 0.5 * (out.data[a * f + b] + out.data[b * f + a]);
                out.data[a * f + b] = s;
                out.data[b * f + a] = s;
            }
        }
        return out;
    }

    /**
     * @param m a P×P matrix; not modified
     * @return Π·m·Π, with Π the orthogonal projector onto the gauge-free subspace
     */
    public DMatrixRMaj project(DMatrixRMaj m) {
        int p = parameters;
        DMatrixRMaj out = m.copy();
        double[] column = new double[p];
        for (int i = 0; i < p; i++) {
            project(out.data, i * p, column);
        }
        for (int c = 0; c < p; c++) {
            for (int i = 0; i < p; i++) {
                column[i] = out.data[i * p + c];
            }
            project(column);
            for (int i = 0; i < p; i++) {
                out.data[i * p + c] = column[i];
            }
        }
        return out;
    }

    private void project(double[] data, int offset, double[] scratch) {
        System.arraycopy(data, offset, scratch, 0, parameters);
        project(scratch);
        System.arraycopy(scratch, 0, data, offset, parameters);
    }

    /** @return B, the P × {@link #freeDimension()} orthonormal basis of the gauge-free subspace (a fresh matrix) */
    public DMatrixRMaj basis() {
        int f = freeDimension();
        DMatrixRMaj b = new DMatrixRMaj(parameters, f);
        double[] unit = new double[f];
        double[] full = new double[parameters];
        for (int c = 0; c < f; c++) {
            unit[c] = 1.0;
            expand(unit, full);
            unit[c] = 0.0;
            for (int i = 0; i < parameters; i++) {
                b.data[i * f + c] = full[i];
            }
        }
        return b;
    }
}
