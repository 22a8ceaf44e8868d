package wayward.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import wayward.image.GrayFrame;

class FrameSlotTest {
    @Test
    void liveModeKeepsTheNewestFrameAndCountsDrops() throws InterruptedException {
        FrameSlot slot = new FrameSlot(false);
        for (int i = 0; i < 3; i++) {
            GrayFrame f = slot.writable(4, 2);
            f.frameIndex = i;
            assertTrue(slot.publish());
        }
        GrayFrame got = slot.take(10);
        assertEquals(2, got.frameIndex);
        assertEquals(2, slot.dropped());
        assertNull(slot.take(1), "nothing new");
    }

    @Test
    void buffersAreReusedAndNeverShared() throws InterruptedException {
        FrameSlot slot = new FrameSlot(false);
        GrayFrame a = slot.writable(4, 2);
        slot.publish();
        GrayFrame read = slot.take(10);
        assertSame(a, read);
        GrayFrame b = slot.writable(4, 2);
        assertTrue(b != read, "the writer never fills the frame the reader holds");
    }

    @Test
    @Timeout(value = 10, unit = TimeUnit.SECONDS)
    void losslessModeDeliversEveryFrameInOrder() throws InterruptedException {
        FrameSlot slot = new FrameSlot(true);
        Thread writer = new Thread(() -> {
            try {
                for (int i = 0; i < 500; i++) {
                    GrayFrame f = slot.writable(4, 2);
                    f.frameIndex = i;
                    slot.publish();
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            } finally {
                slot.close();
            }
        });
        writer.start();
        List<Long> seen = new ArrayList<>();
        while (true) {
            GrayFrame f = slot.take(1000);
            if (f == null) {
                if (slot.drained()) {
                    break;
                }
                continue;
            }
            seen.add(f.frameIndex);
        }
        writer.join();
        assertEquals(500, seen.size());
        for (int i = 0; i < seen.size(); i++) {
            assertEquals(i, seen.get(i));
        }
        assertEquals(0, slot.dropped());
    }
}
