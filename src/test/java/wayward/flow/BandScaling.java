package wayward.flow;

import java.util.Locale;

/**
 * Times one estimator with 1 and 2 band threads on the benchmark frames, in a plain loop (not a test; run by
 * hand, DEVELOPERS.md "Two threads"): {@code java -cp target/test-classes:target/classes wayward.flow.BandScaling}.
 */
public final class BandScaling {
    private BandScaling() {
    }

    public static void main(String[] args) {
        for (int[] size : new int[][] {{320, 240}, {640, 360}}) {
            byte[][] ab = BenchFrames.pair(size[0], size[1]);
            for (int round = 0; round < 3; round++) {
                StringBuilder line = new StringBuilder(size[0] + "x" + size[1]);
                for (int threads : new int[] {1, 2}) {
                    try (FlowEstimator e = FlowEstimator.create(size[0], size[1], FlowSettings.defaults().withThreads(threads))) {
                        FlowField f = e.newField();
                        for (int i = 0; i < 300; i++) {
                            e.push(ab[i % 2], f);
                        }
                        long t0 = System.nanoTime();
                        for (int i = 0; i < 1000; i++) {
                            e.push(ab[i % 2], f);
                        }
                        line.append(String.format(Locale.ROOT, "  %d thread(s): %.3f ms", threads, (System.nanoTime() - t0) / 1e9));
                    }
                }
                System.out.println(line);
            }
        }
    }
}
