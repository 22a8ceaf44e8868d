package wayward.retry;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class BackoffTest {
    @Test
    void stepsDoubleUpToTheCeilingWithAtMostAQuarterOfJitterAndResetAfterASuccess() {
        Backoff b = new Backoff(500, 30_000);
        long[] steps = {500, 1000, 2000, 4000, 8000, 16_000, 30_000, 30_000};
        for (int round = 0; round < 50; round++) {
            b.reset();
            for (long step : steps) {
                assertEquals(step, b.stepMillis());
                long wait = b.nextMillis();
                assertTrue(wait >= step && wait <= step + step / 4, "wait " + wait + " for step " + step);
            }
        }
        b.reset();
        assertEquals(500, b.stepMillis());
    }

    @Test
    void jitterSpreadsTheWaits() {
        // many failures at once must not come back in step: the waits for one step take many values
        java.util.Set<Long> seen = new java.util.HashSet<>();
        for (int i = 0; i < 200; i++) {
            Backoff b = new Backoff(1000, 1000);
            seen.add(b.nextMillis());
        }
        assertTrue(seen.size() > 50, "distinct waits: " + seen.size());
    }

    @Test
    void aCeilingBelowTheFirstStepIsTheFirstStepAndTheFirstStepMustBePositive() {
        Backoff b = new Backoff(1000, 10);
        assertEquals(1000, b.maxMillis());
        b.nextMillis();
        assertEquals(1000, b.stepMillis());
        assertThrows(IllegalArgumentException.class, () -> new Backoff(0, 10));
    }
}
