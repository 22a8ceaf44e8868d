package wayward.flow;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

class QuickselectTest {
    @Test
    void selectFindsTheKthSmallestAsSortingDoes() {
        Random r = new Random(5);
        for (int trial = 0; trial < 200; trial++) {
            int n = 1 + r.nextInt(300);
            float[] a = new float[n];
            for (int i = 0; i < n; i++) {
                a[i] = r.nextInt(20) - 10 + (r.nextBoolean() ? 0.5f : 0f); // many ties
            }
            float[] sorted = a.clone();
            Arrays.sort(sorted);
            int k = r.nextInt(n);
            assertEquals(sorted[k], Quickselect.kth(a.clone(), n, k), "n " + n + " k " + k);
        }
    }

    @Test
    void sampledSelectFindsTheKthSmallestAsSortingDoes() {
        // truth: Arrays.sort; large arrays (the sampled bracket only runs from 4 × SAMPLE values), ties, skewed
        // values and ranks near both ends (where the bracket may miss and the plain selection takes over)
        Random r = new Random(7);
        float[] inside = new float[5000];
        float[] sample = new float[Quickselect.SAMPLE];
        for (int trial = 0; trial < 300; trial++) {
            int n = 1 + r.nextInt(5000);
            float[] a = new float[n];
            for (int i = 0; i < n; i++) {
                a[i] = switch (trial % 3) {
                    case 0 -> (float) r.nextGaussian();
                    case 1 -> r.nextInt(7) * 0.25f;
                    default -> i < n / 3 ? 100f + i : (float) r.nextGaussian();
                };
            }
            float[] sorted = a.clone();
            Arrays.sort(sorted);
            int k = trial % 4 == 0 ? r.nextInt(Math.min(n, 20)) : trial % 4 == 1 ? n - 1 - r.nextInt(Math.min(n, 20))
                    : trial % 4 == 2 ? n / 2 : r.nextInt(n);
            assertEquals(sorted[k], Quickselect.kth(a, n, k, inside, sample), "n " + n + " k " + k);
        }
    }
}
