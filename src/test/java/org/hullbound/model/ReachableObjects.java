package org.hullbound.model;

import java.lang.reflect.Array;
import java.lang.reflect.Field;
import java.lang.reflect.Modifier;
import java.util.ArrayList;
import java.util.Collection;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.Predicate;

/**
 * Counts the objects reachable from a root by walking the fields of the project's own classes and
 * arrays (common practice for tests of what a structure holds: a count that grows with the rows
 * shows an object per row, with no timing or heap figure involved).
 */
final class ReachableObjects {
  private ReachableObjects() {}

  /** A set of objects by identity, to share between walks that must not count twice. */
  static Set<Object> seen() {
    return java.util.Collections.newSetFromMap(new IdentityHashMap<>());
  }

  /**
   * How many objects that {@code counted} accepts, not already in {@code seen}, are reachable from
   * {@code root}: through the fields of the project's own classes, arrays and, when {@code
   * collections}, the elements of the JDK's collections and maps (read through their interfaces;
   * a collection of the project's own, such as a list that makes its elements when asked, is
   * walked by its fields instead); an object that {@code stop} accepts is neither counted nor
   * entered. Adds what it visits to {@code seen}.
   */
  static int count(Object root, Predicate<Object> counted, boolean collections,
      Predicate<Object> stop, Set<Object> seen) {
    List<Object> pending = new ArrayList<>();
    pending.add(root);
    int count = 0;
    while (!pending.isEmpty()) {
      Object o = pending.remove(pending.size() - 1);
      if (o == null || stop.test(o) || !seen.add(o)) {
        continue;
      }
      Class<?> c = o.getClass();
      if (counted.test(o)) {
        count++;
      }
      if (c.isArray()) {
        if (!c.getComponentType().isPrimitive()) {
          for (int i = 0; i < Array.getLength(o); i++) {
            pending.add(Array.get(o, i));
          }
        }
      } else if (c.getName().startsWith("org.hullbound.")) {
        for (Class<?> k = c; k != null && k.getName().startsWith("org.hullbound."); k =
            k.getSuperclass()) {
          for (Field f : k.getDeclaredFields()) {
            if (Modifier.isStatic(f.getModifiers()) || f.getType().isPrimitive()) {
              continue;
            }
            f.setAccessible(true);
            try {
              pending.add(f.get(o));
            } catch (IllegalAccessException e) {
              throw new AssertionError(e);
            }
          }
        }
      } else if (collections && o instanceof Collection<?> collection) {
        pending.addAll(collection);
      } else if (collections && o instanceof Map<?, ?> map) {
        pending.addAll(map.keySet());
        pending.addAll(map.values());
      }
    }
    return count;
  }
}
