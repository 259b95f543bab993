package settle.cluster;

import settle.experiments.run.ReplicateExecutor;
import settle.experiments.study.ClusterExecutorFactory;
import settle.experiments.study.StudyContext;

/** Registers {@link SparkExecutor} for {@code settle run --cluster MASTER} (found through ServiceLoader). */
public final class SparkExecutorFactory implements ClusterExecutorFactory {

    @Override
    public String engine() {
        return "Apache Spark";
    }

    @Override
    public ReplicateExecutor create(String master, StudyContext context) {
        return new SparkExecutor(master, context);
    }
}
