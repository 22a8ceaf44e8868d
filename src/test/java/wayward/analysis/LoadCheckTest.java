package wayward.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** The analysis rate the metrics show: never NaN, measured since the start until the first 30 s check. */
class LoadCheckTest {
    @Test
    void rateIsZeroBeforeTheStartThenSinceTheStartThenOverTheLastCheck() {
        LoadCheck load = new LoadCheck("dock", 10);
        assertEquals(0, load.fps(0, 5_000_000_000L));
        load.started(1_000_000_000L);
        assertEquals(0, load.fps(0, 1_000_000_000L));
        // 12 frames in the 4 s since the start
        assertEquals(3.0, load.fps(12, 5_000_000_000L), 1e-12);
        // the watcher's check: 240 frames in 30 s; from then on the checked rate, whatever the counts since
        load.check(30, 240, 0);
        assertEquals(8.0, load.fps(500, 99_000_000_000L), 1e-12);
    }
}
