package settle.engine.model;

/** The softmax gauge: adding one constant to every class score leaves every probability unchanged. */
final class SoftmaxCentring {

    private SoftmaxCentring() {
    }

    /**
     * Centres the biases of a softmax layer and, when {@code weightsToo}, each column of its weight matrix
     * (the same input's weight across the classes).
     *
     * @param theta modified
     * @param weightOffset where the (classes, inputs) row-major weights start
     * @param biasOffset where the {@code classes} biases start
     */
    static void centreOutputs(double[] theta, int weightOffset, int classes, int inputs, int biasOffset,
            boolean weightsToo) {
        double mean = 0;
        for (int k = 0; k < classes; k++) {
            mean += theta[biasOffset + k];
        }
        mean /= classes;
        for (int k = 0; k < classes; k++) {
            theta[biasOffset + k] -= mean;
        }
        if (!weightsToo) {
            return;
        }
        for (int j = 0; j < inputs; j++) {
            double column = 0;
            for (int k = 0; k < classes; k++) {
                column += theta[weightOffset + k * inputs + j];
            }
            column /= classes;
            for (int k = 0; k < classes; k++) {
                theta[weightOffset + k * inputs + j] -= column;
            }
        }
    }
}
