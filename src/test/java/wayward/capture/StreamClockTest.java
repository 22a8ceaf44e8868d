package wayward.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.bytedeco.ffmpeg.global.avutil;
import org.junit.jupiter.api.Test;

class StreamClockTest {
    private static final double TB = 1.0 / 90_000; // RTP's 90 kHz video clock (RFC 3551), common practice
    private static final long FRAME = 3600;        // one frame at 25 fps in 90 kHz ticks

    @Test
    void noneIsFfmpegsAbsentTimestamp() {
        assertEquals(avutil.AV_NOPTS_VALUE, StreamClock.NONE);
    }

    @Test
    void framesCountFromTheFirstTimestampWhateverItIs() {
        StreamClock c = new StreamClock(true, () -> 0);
        c.opened(false, 1.0 / 25);
        long start = 1_234_567_890L; // a camera's clock starts anywhere
        for (int n = 0; n < 10; n++) {
            assertEquals(n / 25.0, c.frameSeconds(start + n * FRAME, TB), 1e-9);
        }
        // a packet on the same clock
        assertEquals(0.4, c.packetSeconds(start + 10 * FRAME, TB), 1e-9);
    }

    @Test
    void aJumpBackOrFarForwardIsSplicedOneFrameOn() {
        StreamClock c = new StreamClock(true, () -> 0);
        c.opened(false, 1.0 / 25);
        c.frameSeconds(1000 * FRAME, TB);
        c.frameSeconds(1001 * FRAME, TB);
        // the camera restarts its clock at 0: one frame on, then on from there
        assertEquals(2 / 25.0, c.frameSeconds(0, TB), 1e-9);
        assertEquals(3 / 25.0, c.frameSeconds(FRAME, TB), 1e-9);
        // 20 s forward (more than 10): spliced too
        assertEquals(4 / 25.0, c.frameSeconds(FRAME + 20 * 90_000, TB), 1e-9);
        // 5 s forward is a gap in the stream, kept
        assertEquals(4 / 25.0 + 5, c.frameSeconds(FRAME + 25 * 90_000, TB), 1e-9);
    }

    @Test
    void aLoopOrAReconnectContinuesOneFrameAfterTheLastFrame() {
        StreamClock c = new StreamClock(false, () -> 0);
        c.opened(false, 0.04);
        for (int n = 0; n < 50; n++) {
            c.frameSeconds(n * FRAME, TB);
        }
        assertEquals(49 * 0.04, c.lastSeconds(), 1e-9);
        c.nextPass();
        c.opened(false, Double.NaN); // the same file again: the nominal rate stays
        assertEquals(50 * 0.04, c.packetSeconds(0, TB), 1e-9);
        assertEquals(50 * 0.04, c.frameSeconds(0, TB), 1e-9);
        assertEquals(51 * 0.04, c.frameSeconds(FRAME, TB), 1e-9);
    }

    @Test
    void aFrameWithoutTimestampIsOneIntervalOnAndAPacketWithoutOneTakesTheLastFrames() {
        StreamClock c = new StreamClock(true, () -> 0);
        c.opened(false, 0.1);
        assertEquals(0, c.frameSeconds(StreamClock.NONE, TB), 1e-9);
        assertEquals(0.1, c.frameSeconds(StreamClock.NONE, TB), 1e-9);
        assertEquals(0.1, c.packetSeconds(StreamClock.NONE, TB), 1e-9);
    }

    @Test
    void anUntimedLiveSourceRunsOnTheWallClockStrictlyIncreasing() {
        long[] now = {5_000_000_000L};
        StreamClock c = new StreamClock(true, () -> now[0]);
        c.opened(true, 0.1);
        // the made-up timestamps are ignored; time starts at 0 and follows the wall clock
        assertEquals(0, c.packetSeconds(999, TB), 1e-9);
        assertEquals(0.001, c.packetSeconds(999, TB), 1e-9); // same instant: strictly after the last packet
        now[0] += 250_000_000L;
        assertEquals(0.25, c.frameSeconds(12345, TB), 1e-9);
        assertEquals(0.251, c.frameSeconds(12345, TB), 1e-9);
        // reconnected 2 s later: the wall clock starts again one interval after the last frame
        c.nextPass();
        c.opened(true, 0.1);
        now[0] += 2_000_000_000L;
        assertEquals(0.351, c.frameSeconds(0, TB), 1e-9);
        // a file of the same container is timed by its own timestamps
        StreamClock file = new StreamClock(false, () -> now[0]);
        file.opened(true, 0.1);
        assertEquals(0, file.frameSeconds(90_000, TB), 1e-9);
        assertEquals(0.5, file.frameSeconds(135_000, TB), 1e-9);
        assertTrue(file.lastSeconds() > 0);
    }
}
