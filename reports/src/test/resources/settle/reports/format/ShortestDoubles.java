// Makes shortest-doubles.txt, the reference NumberTextTest compares settle's JSON number writer with.
// Run with a JDK 19 or later, whose Double.toString gives the shortest round-trip decimal (JDK-4511638, Raffaello
// Giulietti's Schubfach algorithm): /usr/lib/jvm/temurin-25-jdk-amd64/bin/java ShortestDoubles.java > shortest-doubles.txt
// Each line: the double's 64 bits in hex, a tab, Double.toString of it. The first line names the JDK that wrote it.
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

public class ShortestDoubles {
    public static void main(String[] args) {
        if (Runtime.version().feature() < 19) {
            throw new IllegalStateException("needs JDK 19 or later: Double.toString of JDK 17 is not the shortest form");
        }
        List<Double> values = new ArrayList<>();
        double[] edges = {0.0, -0.0, Double.MIN_VALUE, -Double.MIN_VALUE, Double.MIN_NORMAL, Double.MAX_VALUE,
            Math.nextDown(Double.MIN_NORMAL), Math.nextUp(Double.MIN_VALUE), 1.0, -1.0, 0.1, 0.2, 0.3, 1.0 / 3,
            2.0 / 3, 1e-3, 1e-4, 1e7, 1e8, 9999999.999999998, 0.001, Math.nextDown(1e-3), Math.nextUp(1e7),
            Math.nextDown(1e7), 1e22, 1e23, 2e23, 8.41e21, 5e-324, 4.9e-324, 1e16, 1e17, 123456789012345680.0,
            9007199254740992.0, 9007199254740994.0, 2.2250738585072014E-308, 2.225073858507201E-308,
            1.7976931348623157E308, 4.8726570057E288, 7.0E-10, 2.82879384806159E17, 1.387364135037754E18,
            1.45800632428665E17, 1.9400994884341945E25, 5.684341886080802E-14, 1.0E-5, 1.0E-6};
        for (double d : edges) {
            values.add(d);
        }
        for (int e = -325; e <= 308; e++) {
            double p = Double.parseDouble("1e" + e);
            values.add(p);
            values.add(Math.nextUp(p));
            values.add(Math.nextDown(p));
        }
        for (int e = -1074; e <= 1023; e += 7) {
            double p = Math.scalb(1.0, e);
            values.add(p);
            values.add(Math.nextDown(p));
        }
        SplittableRandom random = new SplittableRandom(20260512L);
        for (int i = 0; i < 4000; i++) {
            double d = Double.longBitsToDouble(random.nextLong());
            if (Double.isFinite(d)) {
                values.add(d);
            }
        }
        for (int i = 0; i < 2000; i++) {
            values.add(random.nextDouble() * Math.pow(10, random.nextInt(-12, 12)));
        }
        System.out.println("# " + System.getProperty("java.vm.vendor") + " " + System.getProperty("java.runtime.version"));
        for (double d : values) {
            System.out.println(Long.toHexString(Double.doubleToRawLongBits(d)) + "\t" + Double.toString(d));
        }
    }
}
