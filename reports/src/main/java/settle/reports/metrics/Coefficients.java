package settle.reports.metrics;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;

/**
 * θ* of a logistic model labelled by input name, in the parameter order of DESIGN.md: binary logistic regression has
 * θ = (w_0 … w_{d−1}, b), the weights of class 1's log-odds against class 0; softmax regression over K classes has
 * θ = (W_0 (d), …, W_{K−1} (d), b_0 … b_{K−1}). Both the report and {@code settle minimum} name θ's coordinates
 * through here.
 *
 * @param groups one group for binary logistic regression (class 1 against class 0), else one per class
 */
public record Coefficients(List<Group> groups) {

    public Coefficients {
        groups = List.copyOf(groups);
    }

    /**
     * The weights of one class's score (binary: the log-odds of class 1).
     *
     * @param className the class whose score they raise
     * @param against the class the log-odds are against (binary), or null (softmax)
     * @param weights one per input, in input order. Not copied: treat as read-only.
     * @param bias its bias
     */
    public record Group(String className, String against, double[] weights, double bias) {

        /**
         * @param n how many
         * @return the indices of the n weights of largest magnitude, largest first (ties by input order)
         */
        public int[] largest(int n) {
            Integer[] order = new Integer[weights.length];
            for (int j = 0; j < order.length; j++) {
                order[j] = j;
            }
            Arrays.sort(order, Comparator.comparingDouble((Integer j) -> -Math.abs(weights[j])).thenComparingInt(
                    j -> j));
            int[] out = new int[Math.min(n, order.length)];
            for (int i = 0; i < out.length; i++) {
                out[i] = order[i];
            }
            return out;
        }
    }

    /**
     * @param theta θ, P values
     * @param inputs d, the number of inputs
     * @param classNames the K class names, class 0 first
     * @return θ split by class, or null when P is neither d + 1 (binary, K = 2) nor K·(d + 1) (softmax)
     */
    public static Coefficients of(double[] theta, int inputs, List<String> classNames) {
        int k = classNames.size();
        int d = inputs;
        List<Group> groups = new ArrayList<>();
        if (k == 2 && theta.length == d + 1) {
            groups.add(new Group(classNames.get(1), classNames.get(0), Arrays.copyOfRange(theta, 0, d), theta[d]));
            return new Coefficients(groups);
        }
        if (k >= 2 && theta.length == k * (d + 1)) {
            for (int c = 0; c < k; c++) {
                groups.add(new Group(classNames.get(c), null, Arrays.copyOfRange(theta, c * d, (c + 1) * d),
                        theta[k * d + c]));
            }
            return new Coefficients(groups);
        }
        return null;
    }

    /** @return true for binary logistic regression (one group: class 1 against class 0) */
    public boolean binary() {
        return groups.size() == 1;
    }

    /**
     * @param inputNames the inputs' names, in input order
     * @return one label per coordinate of θ, in θ's order: "w[glucose]" (binary), "w[class b, glucose]" (softmax),
     *     "bias" or "bias[class b]"
     */
    public List<String> labels(List<String> inputNames) {
        List<String> out = new ArrayList<>();
        if (binary()) {
            for (String name : inputNames) {
                out.add("w[" + name + "]");
            }
            out.add("bias");
            return out;
        }
        for (Group g : groups) {
            for (String name : inputNames) {
                out.add("w[class " + g.className() + ", " + name + "]");
            }
        }
        for (Group g : groups) {
            out.add("bias[class " + g.className() + "]");
        }
        return out;
    }
}
