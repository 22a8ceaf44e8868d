package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.function.Predicate;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/**
 * The notify protocol as systemd speaks it (sd_notify(3)): the service, started with NOTIFY_SOCKET and
 * WATCHDOG_USEC as systemd sets them for Type=notify with WatchdogSec, talks to a Unix datagram socket held
 * by a small Python receiver (Debian's python3). READY=1 after start, WATCHDOG=1 at half the interval,
 * RELOADING=1 then READY=1 around SIGHUP, STOPPING=1 on SIGTERM.
 */
class SystemdNotifyIT {
    private static List<String> awaitMessages(Path file, Predicate<List<String>> done, long seconds) throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(seconds);
        List<String> lines = List.of();
        while (System.nanoTime() < deadline) {
            lines = Files.exists(file) ? Files.readAllLines(file) : List.of();
            if (done.test(lines)) {
                return lines;
            }
            TimeUnit.MILLISECONDS.sleep(100); // polling the receiver's file, not a synchronisation sleep
        }
        throw new AssertionError("messages so far: " + lines);
    }

    private static long count(List<String> lines, String message) {
        return lines.stream().filter(message::equals).count();
    }

    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void readyWatchdogReloadAndStopReachTheNotifySocket(@TempDir Path dir) throws Exception {
        Path socket = dir.resolve("notify.sock");
        Path got = dir.resolve("notify.txt");
        Path receiverScript = ProcessRunner.projectDir().resolve("src/test/resources/systemd/notify-receiver.py");
        Process receiver = new ProcessBuilder("/usr/bin/python3", receiverScript.toString(), socket.toString(),
                got.toString()).redirectErrorStream(true).start();
        Process service = null;
        try {
            awaitMessages(got, l -> l.contains("bound"), 20);
            Path site = YardSite.looping(dir, "[clips]", "enabled = false");
            ProcessBuilder pb = new ProcessBuilder("java", "-jar", ProcessRunner.jar().toString(), "run", "--config",
                    site.toString()).directory(dir.toFile()).redirectErrorStream(true)
                    .redirectOutput(dir.resolve("service.log").toFile());
            pb.environment().put("NOTIFY_SOCKET", socket.toString());
            pb.environment().put("WATCHDOG_USEC", "2000000"); // WatchdogSec=2: a ping every second
            service = pb.start();
            long pid = service.pid();
            List<String> m = awaitMessages(got, l -> count(l, "WATCHDOG=1") >= 2, 40);
            String ready = m.stream().filter(s -> s.startsWith("READY=1")).findFirst().orElse("");
            assertEquals("READY=1|STATUS=watching 1 cameras|MAINPID=" + pid, ready);
            assertTrue(m.indexOf(ready) < m.indexOf("WATCHDOG=1"), "ready before the first ping: " + m);

            YardSite.command("kill", "-HUP", Long.toString(pid));
            // (fails unless READY comes again after RELOADING)
            awaitMessages(got, l -> l.contains("RELOADING=1") && l.lastIndexOf("READY=1|STATUS=watching 1 cameras")
                    > l.indexOf("RELOADING=1"), 30);

            service.destroy(); // SIGTERM
            assertTrue(service.waitFor(30, TimeUnit.SECONDS));
            awaitMessages(got, l -> l.contains("STOPPING=1"), 10); // fails unless STOPPING comes
            // a JVM that ran its shutdown hooks on SIGTERM exits with 128 + 15; the unit counts 143 as success
            assertEquals(143, service.exitValue(), Files.readString(dir.resolve("service.log")));
            assertTrue(Files.readString(dir.resolve("service.log")).contains("Service: stopped"));
        } finally {
            if (service != null) {
                service.destroyForcibly();
            }
            receiver.destroyForcibly();
        }
    }
}
