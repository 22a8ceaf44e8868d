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
}
