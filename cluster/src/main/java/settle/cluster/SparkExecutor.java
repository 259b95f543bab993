package settle.cluster;

import java.io.Serializable;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.TimeUnit;
import org.apache.spark.SimpleFutureAction;
import org.apache.spark.SparkConf;
import org.apache.spark.SparkException;
import org.apache.spark.api.java.JavaRDD;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.broadcast.Broadcast;
import scala.collection.Iterator;
import scala.jdk.javaapi.CollectionConverters;
import scala.runtime.AbstractFunction0;
import scala.runtime.AbstractFunction1;
import scala.runtime.AbstractFunction2;
import scala.runtime.BoxedUnit;
import settle.experiments.run.ReplicateExecutor;
import settle.experiments.run.ReplicateKey;
import settle.experiments.run.ReplicateOutcome;
import settle.experiments.run.ReplicateWork;
import settle.experiments.run.WorkFailedException;
import settle.experiments.study.ClusterExecutorFactory;
import settle.experiments.study.StudyContext;
import settle.experiments.study.StudyRunner;
import settle.input.BadInputException;

/**
 * Runs a study's units of work as Apache Spark tasks: one job whose partitions are the units (replicate k of the
 * arms that train together, or of one arm), one unit per partition and so per task. The resolved plan and the
 * data's rows go to each executor once, as a broadcast ({@link StudyShipment}); each executor builds its study
 * context from it once and trains the units it is given with {@link StudyRunner#outcomes}, the very function a
 * local run uses, so the files are the same bytes. Each task returns its replicate files' bytes; Spark hands every
 * finished task's result to the driver as it arrives, and the driver passes each replicate to the sink (which
 * writes it atomically) at once, so a driver that dies loses only the units in flight. A failed task is retried by
 * Spark, up to {@code spark.task.maxFailures} attempts ({@code local[N,F]} in local mode); only the driver writes,
 * once per replicate, whatever the number of attempts.
 *
 * <p>The {@link ReplicateWork} that {@link #runAll} receives is the driver's local form of that same function
 * (it holds the driver's context, which is not shipped); this executor runs {@link StudyRunner#outcomes} on the
 * executors' own contexts instead.
 */
public final class SparkExecutor implements ReplicateExecutor, AutoCloseable {

    /** What a task does with its unit of work on an executor; the default is {@link StudyRunner#outcomes}. */
    @FunctionalInterface
    interface TaskBody extends Serializable {
        ArrayList<ReplicateOutcome> train(StudyContext context, List<ReplicateKey> unit);
    }

    private static final long POLL_MILLIS = 100;

    private final String master;
    private final StudyShipment shipment;
    private final TaskBody body;
    private JavaSparkContext spark;

    /**
     * @param master the Spark master URL ({@code local[2]}, {@code local[2,3]}, {@code spark://host:7077},
     *     {@code yarn}); the Spark context is started on first use
     * @param context the study on the driver
     * @throws settle.input.BadInputException when the plan has manual arms
     */
    public SparkExecutor(String master, StudyContext context) {
        this(master, context, new Train());
    }

    SparkExecutor(String master, StudyContext context, TaskBody body) {
        if (master == null || master.isBlank()) {
            throw BadInputException.of("--cluster", "--cluster needs a Spark master URL, e.g. local[2],"
                    + " spark://host:7077 or yarn");
        }
        ClusterExecutorFactory.refuseManualArms(context.parsed());
        this.master = master;
        this.shipment = new StudyShipment(context);
        this.body = body;
    }

    /**
     * The configuration settle starts Spark with: {@code spark.*} system properties (and what
     * {@code spark-submit} set) first, then settle's defaults where those say nothing: no web UI, no limit on
     * the results' total size (they stream to disk, not to memory), for a local master the driver on the
     * loopback address, and for any other master (unless {@code spark.jars} is set, as spark-submit does) the
     * jar settle runs from, shipped to the executors.
     *
     * @return the configuration for {@code master}
     */
    static SparkConf configuration(String master, String study) {
        SparkConf conf = new SparkConf().setMaster(master).setAppName("settle " + study);
        conf.setIfMissing("spark.ui.enabled", "false");
        conf.setIfMissing("spark.driver.maxResultSize", "0");
        if (master.startsWith("local")) {
            conf.setIfMissing("spark.driver.host", "127.0.0.1");
            conf.setIfMissing("spark.driver.bindAddress", "127.0.0.1");
        } else if (!conf.contains("spark.jars")) {
            // started by ./settle rather than spark-submit: ship this jar, so the executors have settle's classes
            String jar = ownJar();
            if (jar != null) {
                conf.set("spark.jars", jar);
            }
        }
        return conf;
    }

    /** @return the jar this class was loaded from, or null when it was loaded from a directory (tests) */
    private static String ownJar() {
        try {
            java.security.CodeSource source = SparkExecutor.class.getProtectionDomain().getCodeSource();
            if (source == null) {
                return null;
            }
            java.nio.file.Path path = java.nio.file.Path.of(source.getLocation().toURI());
            return path.toString().endsWith(".jar") ? path.toString() : null;
        } catch (java.net.URISyntaxException | SecurityException e) {
            return null;
        }
    }

    private synchronized JavaSparkContext started() {
        if (spark == null) {
            try {
                spark = new JavaSparkContext(configuration(master, shipment.study()));
            } catch (Exception e) {
                // Scala declares no exceptions: a master Spark cannot parse comes as a SparkException
                if (e instanceof SparkException) {
                    String hint = master.startsWith("yarn") || master.startsWith("k8s://")
                            ? " (settle's cluster build holds Spark's core only: submit to YARN or Kubernetes with"
                                    + " spark-submit from a Spark installation, docs/cluster.md)"
                            : "";
                    throw BadInputException.of("--cluster", "--cluster " + master + ": " + firstLine(e.getMessage())
                            + hint).because(e);
                }
                throw e;
            }
        }
        return spark;
    }

    @Override
    public String describe() {
        return "Apache Spark " + started().version() + ", master " + master;
    }

    @Override
    public int parallelism() {
        return started().defaultParallelism();
    }

    @Override
    public void runAll(List<List<ReplicateKey>> units, ReplicateWork work, Sink sink) throws Exception {
        int total = 0;
        List<ArrayList<ReplicateKey>> shipped = new ArrayList<>(units.size());
        for (List<ReplicateKey> unit : units) {
            total += unit.size();
            shipped.add(new ArrayList<>(unit));
        }
        if (total == 0) {
            return;
        }
        JavaSparkContext sc = started();
        Broadcast<StudyShipment> broadcast = sc.broadcast(shipment);
        // parallelize over n slices puts exactly one unit in each partition: one unit of work, one task
        JavaRDD<ArrayList<ReplicateKey>> replicates = sc.parallelize(shipped, shipped.size());
        List<Object> partitions = new ArrayList<>(shipped.size());
        for (int i = 0; i < shipped.size(); i++) {
            partitions.add(i);
        }
        BlockingQueue<ReplicateOutcome> arrived = new LinkedBlockingQueue<>();
        sc.setJobDescription("settle: " + total + " replicates in " + shipped.size() + " units");
        SimpleFutureAction<BoxedUnit> job = sc.sc().submitJob(replicates.rdd(), new TrainPartition(broadcast, body),
                CollectionConverters.asScala(partitions).toSeq(), new Arrival(arrived), new NoResult());
        Set<ReplicateKey> written = new HashSet<>();
        try {
            while (written.size() < total) {
                ReplicateOutcome outcome = arrived.poll(POLL_MILLIS, TimeUnit.MILLISECONDS);
                if (outcome == null) {
                    // the result handler runs before the job completes, so a completed job has queued everything
                    if (job.isCompleted() && arrived.isEmpty()) {
                        failure(job, written.size(), total);
                    }
                    continue;
                }
                if (written.add(outcome.key())) {
                    sink.accept(outcome);
                }
            }
        } finally {
            if (!job.isCompleted()) {
                job.cancel();
            }
            broadcast.destroy();
        }
    }

    private static void failure(SimpleFutureAction<BoxedUnit> job, int done, int total) throws Exception {
        try {
            job.get();
        } catch (SparkException e) {
            // get() wraps the job's own failure ("Job aborted due to stage failure: ...") in its own
            Throwable cause = e;
            while (cause.getCause() instanceof SparkException) {
                cause = cause.getCause();
            }
            throw new WorkFailedException("the Spark job failed after " + done + " of " + total + " replicates: "
                    + firstLine(cause.getMessage()), e);
        }
        throw new WorkFailedException("the Spark job ended with " + done + " of " + total + " replicates returned",
                null);
    }

    private static String firstLine(String message) {
        if (message == null) {
            return "";
        }
        int cut = message.indexOf('\n');
        return cut < 0 ? message : message.substring(0, cut);
    }

    /** Stops the Spark context, if it was started. */
    @Override
    public synchronized void close() {
        if (spark != null) {
            spark.stop();
            spark = null;
        }
    }

    /** The task body of a real run. */
    private static final class Train implements TaskBody {
        private static final long serialVersionUID = 1L;

        @Override
        public ArrayList<ReplicateOutcome> train(StudyContext context, List<ReplicateKey> unit) {
            ArrayList<ReplicateOutcome> outcomes = new ArrayList<>(unit.size());
            StudyRunner.outcomes(context, unit, outcomes::add);
            return outcomes;
        }
    }

    /** Runs on an executor: trains the one unit of work of its partition. */
    private static final class TrainPartition
            extends AbstractFunction1<Iterator<ArrayList<ReplicateKey>>, ArrayList<ReplicateOutcome>>
            implements Serializable {
        private static final long serialVersionUID = 1L;
        private final Broadcast<StudyShipment> shipment;
        private final TaskBody body;

        TrainPartition(Broadcast<StudyShipment> shipment, TaskBody body) {
            this.shipment = shipment;
            this.body = body;
        }

        @Override
        public ArrayList<ReplicateOutcome> apply(Iterator<ArrayList<ReplicateKey>> units) {
            ArrayList<ReplicateKey> unit = units.next();
            if (units.hasNext()) {
                throw new IllegalStateException("a partition holds more than one unit: " + unit + ", " + units.next());
            }
            return body.train(shipment.value().context(), unit);
        }
    }

    /** Runs on the driver as each task's result arrives: queues its replicates for the driver's thread. */
    private static final class Arrival extends AbstractFunction2<Object, ArrayList<ReplicateOutcome>, BoxedUnit> {
        private final BlockingQueue<ReplicateOutcome> arrived;

        Arrival(BlockingQueue<ReplicateOutcome> arrived) {
            this.arrived = arrived;
        }

        @Override
        public BoxedUnit apply(Object partition, ArrayList<ReplicateOutcome> outcomes) {
            arrived.addAll(outcomes);
            return BoxedUnit.UNIT;
        }
    }

    /** The job's overall result: nothing, every outcome went through {@link Arrival}. */
    private static final class NoResult extends AbstractFunction0<BoxedUnit> {
        @Override
        public BoxedUnit apply() {
            return BoxedUnit.UNIT;
        }
    }
}
