package wayward.flow;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;

class BandPoolTest {
    @Test
    @Timeout(value = 30, unit = TimeUnit.SECONDS)
    void bandsOnTwoOrThreeThreadsGiveExactlyTheSingleThreadResult() {
        Textures t = new Textures(8, 12);
        byte[] a = t.render(320, 240, 0, 0, 2, new java.util.SplittableRandom(1));
        byte[] b = t.render(320, 240, 1.7, -0.6, 2, new java.util.SplittableRandom(2));
        FlowField one;
        try (FlowEstimator e = FlowEstimator.create(320, 240, FlowSettings.defaults())) {
            one = e.newField();
            e.compute(a, b, one);
        }
        for (int threads : new int[] {2, 3}) {
            try (FlowEstimator e = FlowEstimator.create(320, 240, FlowSettings.defaults().withThreads(threads))) {
                FlowField many = e.newField();
                for (int round = 0; round < 20; round++) { // repeated: hand-over between frames must hold up
                    e.compute(a, b, many);
                    assertArrayEquals(one.u, many.u, threads + " threads, round " + round);
                    assertArrayEquals(one.v, many.v);
                    assertArrayEquals(one.confidence, many.confidence);
                }
            }
        }
    }
}
