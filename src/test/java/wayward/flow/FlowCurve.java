package wayward.flow;

import java.util.List;
import java.util.Locale;
import java.util.stream.Collectors;
import org.junit.jupiter.params.provider.Arguments;

/**
 * Prints the accuracy side of the speed/accuracy curve: the mean endpoint error over the OpenCV comparison
 * suite ({@link OpenCvReferenceTest#cases()}: 3 textures × 6 motions × 2 noise levels) for a range of settings.
 * Not a test; run by hand (DEVELOPERS.md, "Benchmarks"):
 * {@code java -cp target/test-classes:target/classes:$(cat cp.txt) wayward.flow.FlowCurve}
 */
public final class FlowCurve {
    private FlowCurve() {
    }

    public static void main(String[] args) throws Exception {
        List<Arguments> cases = OpenCvReferenceTest.cases().collect(Collectors.toList());
        FlowSettings d = FlowSettings.defaults();
        FlowSettings[] settings = {
            d.withStride(1, 1).withIterations(3, 3),
            d.withStride(2, 4), d.withStride(2, 4).withIterations(3, 2),
            d, d.withIterations(3, 2), d.withIterations(5, 3), d.withWindowRadius(3), d.withWindowRadius(3).withIterations(3, 2),
            d.withStride(4, 4), d.withLevels(3),
            d.withStride(6, 12), d.withStride(8, 16), d.withStride(8, 16).withWindowRadius(3),
        };
        System.out.println("stride | coarse stride | window | iterations coarse/finest | levels | suite mean EPE (px)");
        for (FlowSettings s : settings) {
            double sum = 0;
            for (Arguments a : cases) {
                Object[] o = a.get();
                Textures t = (Textures) o[1];
                FlowAccuracyTest.Motion m = (FlowAccuracyTest.Motion) o[2];
                byte[][] ab = OpenCvReferenceTest.frames(t, m, (Double) o[3]);
                try (FlowEstimator e = FlowEstimator.create(320, 240, s)) {
                    FlowField f = e.newField();
                    e.compute(ab[0], ab[1], f);
                    sum += FlowAccuracyTest.meanEndpointError(f.toDense(), m);
                }
            }
            System.out.printf(Locale.ROOT, "%d | %d | %d | %d/%d | %s | %.3f%n", s.stride(), s.stride() == 1 ? 1 : s.coarseStride(),
                    2 * s.windowRadius() + 1, s.iterations(), s.stride() == 1 ? s.iterations() : s.finestIterations(),
                    s.levels() == 0 ? "auto (4)" : Integer.toString(s.levels()), sum / cases.size());
        }
    }
}
