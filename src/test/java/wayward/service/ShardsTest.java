package wayward.service;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/** Rendezvous hashing's properties (Thaler and Ravishankar, 1998), checked on 3000 camera ids. */
class ShardsTest {
    private static List<String> cameras() {
        List<String> c = new ArrayList<>();
        for (int i = 0; i < 3000; i++) {
            c.add("yard-cam-" + i);
        }
        return c;
    }

    @Test
    void everyCameraHasOneOwnerAndTheLoadIsEven() {
        Map<String, Integer> count = new HashMap<>();
        for (String c : cameras()) {
            count.merge(Shards.owner(c, List.of("north", "south", "gate")), 1, Integer::sum);
        }
        assertEquals(3, count.size());
        for (int n : count.values()) {
            assertEquals(1000, n, 100, "about a third each: " + count);
        }
        assertEquals(Shards.owner("yard-cam-7", List.of("north", "south", "gate")),
                Shards.owner("yard-cam-7", List.of("gate", "north", "south")), "the list's order does not matter");
    }

    @Test
    void removingAnInstanceMovesOnlyItsCamerasAndAddingOneMovesOnlyWhatItTakes() {
        List<String> three = List.of("north", "south", "gate");
        List<String> two = List.of("north", "gate");
        List<String> four = List.of("north", "south", "gate", "dock");
        int moved = 0;
        for (String c : cameras()) {
            String before = Shards.owner(c, three);
            String after = Shards.owner(c, two);
            if (!before.equals("south")) {
                assertEquals(before, after, c + " did not belong to the removed instance");
            } else {
                moved++;
            }
            String grown = Shards.owner(c, four);
            assertTrue(grown.equals(before) || grown.equals("dock"), c + " moves only to the new instance");
        }
        assertEquals(1000, moved, 100);
    }
}
