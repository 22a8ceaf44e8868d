package wayward.zone;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import org.junit.jupiter.api.Test;
import wayward.flow.FlowField;

class ZoneMeterTest {
    private static final ZoneMask WHOLE = ZoneMask.rasterise(new double[] {0, 1, 1, 0}, new double[] {0, 0, 1, 1}, 10, 10);

    private static FlowField uniform(float u, float v, float confidence) {
        FlowField f = new FlowField(10, 10);
        Arrays.fill(f.u, u);
        Arrays.fill(f.v, v);
        Arrays.fill(f.confidence, confidence);
        return f;
    }

    @Test
    void bearingsAreClockwiseFromImageUp() {
        // screen bearings as defined in DESIGN.md: 0 up, 90 right, 180 down, 270 left (y grows downwards)
        assertEquals(0, ZoneMeter.bearingDeg(0, -1), 1e-9);
        assertEquals(90, ZoneMeter.bearingDeg(1, 0), 1e-9);
        assertEquals(180, ZoneMeter.bearingDeg(0, 1), 1e-9);
        assertEquals(270, ZoneMeter.bearingDeg(-1, 0), 1e-9);
        assertEquals(45, ZoneMeter.bearingDeg(1, -1), 1e-9);
    }

    @Test
    void motionDownAZoneHeadingUpCountsAsAgainst() {
        ZoneMeter m = new ZoneMeter(WHOLE, 0, 60, 5, 1, false);
        ZoneReading r = new ZoneReading();
        m.measure(uniform(0, 2, 10), 0.1, 3.0, r); // 2 px per 0.1 s = 20 px/s downwards
        assertEquals(1.0, r.movingShare, 1e-9);
        assertEquals(1.0, r.againstShare, 1e-9);
        assertEquals(20, r.movingSpeedPxPerSecond, 1e-4);
        assertEquals(180, r.againstBearingDeg, 1e-6);
        assertEquals(3.0, r.streamSeconds);
        assertEquals(100, r.directions[8], "bin 8 is 180 degrees");
    }

    @Test
    void motionWithTheHeadingOrAcrossItIsNotAgainst() {
        ZoneMeter m = new ZoneMeter(WHOLE, 0, 60, 5, 1, false);
        ZoneReading r = new ZoneReading();
        m.measure(uniform(0, -2, 10), 0.1, 0, r);
        assertEquals(1.0, r.movingShare, 1e-9);
        assertEquals(0.0, r.againstShare, 1e-9);
        m.measure(uniform(2, 0, 10), 0.1, 0, r); // crossing, 90 degrees off the heading
        assertEquals(0.0, r.againstShare, 1e-9);
        // 130 degrees: inside the ±60 sector around the opposite bearing 180
        float s = 2f;
        m.measure(uniform((float) (s * Math.sin(Math.toRadians(130))), (float) (-s * Math.cos(Math.toRadians(130))), 10), 0.1, 0, r);
        assertEquals(1.0, r.againstShare, 1e-9);
        assertEquals(130, r.againstBearingDeg, 1e-3);
    }

    @Test
    void slowOrUnconfidentPixelsDoNotVote() {
        ZoneMeter m = new ZoneMeter(WHOLE, 0, 60, 50, 5, false);
        ZoneReading r = new ZoneReading();
        m.measure(uniform(0, 2, 10), 0.1, 0, r); // 20 px/s < 50 px/s
        assertEquals(0, r.movingShare, 1e-9);
        assertTrue(Double.isNaN(r.movingBearingDeg));
        m.measure(uniform(0, 20, 4), 0.1, 0, r); // fast but confidence 4 < 5
        assertEquals(0, r.movingShare, 1e-9);
    }

    @Test
    void cameraMotionIsSubtractedWhenAsked() {
        FlowField f = uniform(0, 2, 10);
        f.globalU = 0;
        f.globalV = 2; // the whole picture moves down: the camera, not the traffic
        ZoneReading r = new ZoneReading();
        new ZoneMeter(WHOLE, 0, 60, 5, 1, true).measure(f, 0.1, 0, r);
        assertEquals(0, r.movingShare, 1e-9);
        assertEquals(2, r.cameraV, 1e-9);
        new ZoneMeter(WHOLE, 0, 60, 5, 1, false).measure(f, 0.1, 0, r);
        assertEquals(1.0, r.againstShare, 1e-9);
    }

    @Test
    void zoneWithoutHeadingMeasuresMotionOnly() {
        ZoneMeter m = new ZoneMeter(WHOLE, Double.NaN, 60, 5, 1, false);
        ZoneReading r = new ZoneReading();
        m.measure(uniform(0, 2, 10), 0.1, 0, r);
        assertEquals(1.0, r.movingShare, 1e-9);
        assertEquals(0.0, r.againstShare, 1e-9);
    }
}
