package settle.engine.theory;
import org.junit.jupiter.api.Test;
import settle.datasets.*;
import settle.engine.minimum.*;
import settle.engine.model.*;
class ScratchWdbcTest {
    @Test
    void scratch() throws Exception {
        Dataset all = DataSources.load("bundled:wdbc", null, null);
        Dataset train0 = Splits.stratified(all, 0.2, 2026L).train();
        Dataset train = Standardiser.fit(train0).apply(train0);
        StringBuilder b = new StringBuilder();
        double[] x = new double[train.features()];
        int[] y = new int[1];
        for (int i = 0; i < train.rows(); i++) {
            train.copyRows(new int[]{i}, 0, 1, x, 0, y);
            for (double v : x) b.append(v).append(',');
            b.append(y[0]).append('\n');
        }
        java.nio.file.Files.writeString(java.nio.file.Path.of("/tmp/mc/wdbc456.csv"), b.toString());
    }
}
