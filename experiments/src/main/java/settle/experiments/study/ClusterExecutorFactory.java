package settle.experiments.study;

import java.util.Iterator;
import java.util.ServiceLoader;
import settle.experiments.plan.ArmPlan;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.run.ReplicateExecutor;
import settle.input.BadInputException;

/**
 * Makes an executor that runs a study's replicates on a cluster engine ({@code settle run --cluster MASTER}).
 * The plain settle jar holds none: the cluster build (module {@code settle-cluster}) registers one through
 * {@link ServiceLoader}, so the plain tool never loads, or ships, the engine's classes.
 */
public interface ClusterExecutorFactory {

    /** How to get the cluster build, for the message shown when it is missing. */
    String HOW_TO_GET_IT = "build it with 'mvn -B -DskipTests package' and run './settle run PLAN --cluster MASTER'"
            + " from the source tree, or submit cluster/target/settle-cluster.jar with spark-submit (docs/cluster.md)";

    /** @return the engine's name, e.g. "Apache Spark" */
    String engine();

    /**
     * @param master where the cluster is, as the engine spells it ({@code local[2]}, {@code spark://host:7077},
     *     {@code yarn})
     * @param context the study on the driver: its resolved plan and its data are shipped to the workers from it
     * @return an executor bound to that study; when it is {@link AutoCloseable}, close it after the run
     * @throws IllegalArgumentException for a master or a plan the engine cannot run (a one-line message)
     */
    ReplicateExecutor create(String master, StudyContext context);

    /**
     * @return the factory of the cluster build on the class path
     * @throws BadInputException when there is none, with a one-line message saying how to get it
     */
    static ClusterExecutorFactory find() {
        Iterator<ClusterExecutorFactory> found =
                ServiceLoader.load(ClusterExecutorFactory.class, ClusterExecutorFactory.class.getClassLoader()).iterator();
        if (!found.hasNext()) {
            throw BadInputException.of("--cluster", "--cluster needs settle's cluster build, which is not on the class path: "
                    + HOW_TO_GET_IT);
        }
        return found.next();
    }

    /**
     * A cluster run takes no nudges (DESIGN.md, study directory): it refuses a plan with manual arms.
     *
     * @throws settle.input.BadInputException positioned at the first manual arm
     */
    static void refuseManualArms(ParsedPlan parsed) {
        for (int i = 0; i < parsed.plan().arms().size(); i++) {
            ArmPlan arm = parsed.plan().arms().get(i);
            if (arm.manual()) {
                throw parsed.error(parsed.armPath(i) + ".manual", "arm '" + arm.name() + "' is manual, and a cluster"
                        + " run cannot take nudges; run this plan without --cluster, or set manual: false");
            }
        }
    }
}
