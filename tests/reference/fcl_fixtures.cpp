// Reference fixtures from the Flexible Collision Library (FCL 0.7, Debian's libfcl-dev).
//
// Builds random pairs of convex primitives (sphere, capsule, box, cylinder: every one of the ten
// combinations) in four regimes (far, near, touching, overlapping) and records, for each pair,
// FCL's separation distance (fcl::distance) and its yes/no collision answer (fcl::collide), both
// with FCL's own GJK solver (GST_INDEP). Writes fixtures/fcl.json. Deterministic: a fixed seed
// and a fixed generator (splitmix64), so regenerating gives the same file on the same FCL.
//
// Shapes in the fixture (SI units, m):
//   sphere   {"k":"sphere","c":[x,y,z],"r":r}
//   capsule  {"k":"capsule","from":[..],"to":[..],"r":r}     (segment from → to, radius r)
//   box      {"k":"box","p":[..],"q":[w,x,y,z],"s":[sx,sy,sz]} (centre p, full side lengths s)
//   cylinder {"k":"cylinder","p":[..],"q":[w,x,y,z],"r":r,"l":l} (axis along the pose's z, centred,
//                                                               full length l)
// Facts about FCL used here (its shape headers): Box takes full side lengths; Capsule and
// Cylinder are centred on their origin with the axis along local z and `lz` the full length of the
// axis segment (the capsule's caps extend beyond it by the radius).
//
// Every number written is rounded to 12 significant digits first and FCL is given exactly the
// rounded values, so the file holds the exact inputs of each reference answer. Quaternions are
// normalised by the reader (both here and in the test) after parsing.
//
// How a pair in a regime is made: B is placed at A's centre plus s·u for a random direction u.
// The distance between A and B moved along a line is a convex function of s (it is the distance
// from the origin to a translated convex set), zero near s = 0, so bisection on s finds the place
// with a given gap. Overlapping pairs back off from the touching place by a random fraction.
// Touching pairs sit just apart (gap +δ) or just overlapping (the touching place moved δ
// inwards), with δ = 1 nm for pairs with a sphere (FCL answers those in closed form) and δ = 1 µm
// for the others (FCL's answers there are iterative; its two solvers differ by up to 1e-7 m).
//
// Build and run (tests/reference/regenerate.sh does this):
//   g++ -O2 -std=c++17 fcl_fixtures.cpp -I/usr/include/eigen3 -lfcl -lccd -o fcl_fixtures
//   ./fcl_fixtures > fixtures/fcl.json
#include <fcl/fcl.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <memory>
#include <string>
#include <vector>

using S = double;
using Vec3 = fcl::Vector3<S>;

namespace {

uint64_t state = 0x5eed2026c0111de5ULL;

// splitmix64 (Steele, Lea and Flood, "Fast splittable pseudorandom number generators", 2014).
uint64_t next() {
  uint64_t z = (state += 0x9e3779b97f4a7c15ULL);
  z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
  z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
  return z ^ (z >> 31);
}

double uniform(double lo, double hi) { return lo + (hi - lo) * (double)(next() >> 11) * (1.0 / 9007199254740992.0); }

double round12(double v) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.12g", v);
  return std::strtod(buf, nullptr);
}

Vec3 randomUnit() {
  while (true) {
    Vec3 v(uniform(-1, 1), uniform(-1, 1), uniform(-1, 1));
    double n = v.norm();
    if (n > 0.1 && n <= 1) return v / n;
  }
}

enum Kind { SPHERE = 0, CAPSULE = 1, BOX = 2, CYLINDER = 3 };
const char* KIND_NAMES[] = {"sphere", "capsule", "box", "cylinder"};

struct Shape {
  Kind kind;
  Vec3 p;          // centre (sphere, box, cylinder); capsule: from
  Vec3 to;         // capsule: to
  double q[4];     // w, x, y, z (box, cylinder)
  Vec3 size;       // box full sides
  double r = 0;    // sphere, capsule, cylinder radius
  double l = 0;    // cylinder full length

  fcl::Matrix3<S> rotation() const {
    fcl::Quaternion<S> quat(q[0], q[1], q[2], q[3]);
    quat.normalize();
    return quat.toRotationMatrix();
  }

  // The FCL geometry and its pose.
  std::shared_ptr<fcl::CollisionGeometry<S>> geometry() const {
    switch (kind) {
      case SPHERE: return std::make_shared<fcl::Sphere<S>>(r);
      case CAPSULE: return std::make_shared<fcl::Capsule<S>>(r, (to - p).norm());
      case BOX: return std::make_shared<fcl::Box<S>>(size[0], size[1], size[2]);
      default: return std::make_shared<fcl::Cylinder<S>>(r, l);
    }
  }

  fcl::Transform3<S> pose(const Vec3& shift) const {
    fcl::Transform3<S> t = fcl::Transform3<S>::Identity();
    if (kind == SPHERE) {
      t.translation() = p + shift;
    } else if (kind == CAPSULE) {
      // Capsule frame: origin at the midpoint, z along from → to (x, y any completing frame).
      Vec3 z = (to - p).normalized();
      Vec3 helper = std::abs(z[0]) < 0.9 ? Vec3(1, 0, 0) : Vec3(0, 1, 0);
      Vec3 x = helper.cross(z).normalized();
      Vec3 y = z.cross(x);
      fcl::Matrix3<S> R;
      R.col(0) = x; R.col(1) = y; R.col(2) = z;
      t.linear() = R;
      t.translation() = 0.5 * (p + to) + shift;
    } else {
      t.linear() = rotation();
      t.translation() = p + shift;
    }
    return t;
  }

  Vec3 centre() const { return kind == CAPSULE ? Vec3(0.5 * (p + to)) : p; }

  void translate(const Vec3& d) {
    p += d;
    if (kind == CAPSULE) to += d;
  }
};

Vec3 roundVec(const Vec3& v) { return Vec3(round12(v[0]), round12(v[1]), round12(v[2])); }

Shape randomShape(Kind kind) {
  Shape s;
  s.kind = kind;
  s.p = roundVec(Vec3(uniform(-0.5, 0.5), uniform(-0.5, 0.5), uniform(-0.5, 0.5)));
  s.q[0] = 1; s.q[1] = s.q[2] = s.q[3] = 0;
  if (kind == SPHERE) {
    s.r = round12(uniform(0.01, 0.25));
  } else if (kind == CAPSULE) {
    s.r = round12(uniform(0.01, 0.15));
    s.to = roundVec(s.p + uniform(0.02, 0.6) * randomUnit());
  } else {
    // Uniform random rotation (Shoemake's method from three uniforms).
    double u1 = uniform(0, 1), u2 = uniform(0, 2 * M_PI), u3 = uniform(0, 2 * M_PI);
    double a = std::sqrt(1 - u1), b = std::sqrt(u1);
    s.q[0] = round12(a * std::sin(u2)); s.q[1] = round12(a * std::cos(u2));
    s.q[2] = round12(b * std::sin(u3)); s.q[3] = round12(b * std::cos(u3));
    if (kind == BOX) {
      s.size = roundVec(Vec3(uniform(0.02, 0.6), uniform(0.02, 0.6), uniform(0.02, 0.6)));
    } else {
      s.r = round12(uniform(0.01, 0.25));
      s.l = round12(uniform(0.02, 0.6));
    }
  }
  return s;
}

struct Answer {
  double distance;     // FCL's separation distance (GJKSolver_indep); -1 when FCL reports a collision
  double distanceCcd;  // the same with FCL's libccd solver (GJKSolver_libccd)
  bool hit;            // fcl::collide found a contact (GJKSolver_indep)
  bool hitCcd;         // the same with the libccd solver
};

double fclDistance(const fcl::CollisionGeometry<S>* ga, const fcl::Transform3<S>& ta, const fcl::CollisionGeometry<S>* gb, const fcl::Transform3<S>& tb, fcl::GJKSolverType solver) {
  fcl::DistanceRequest<S> req(true, false, 0.0, 0.0, 1e-12, solver);
  fcl::DistanceResult<S> res;
  return fcl::distance(ga, ta, gb, tb, req, res);
}

bool fclCollide(const fcl::CollisionGeometry<S>* ga, const fcl::Transform3<S>& ta, const fcl::CollisionGeometry<S>* gb, const fcl::Transform3<S>& tb, fcl::GJKSolverType solver) {
  fcl::CollisionRequest<S> req(1, false, 1, false, true, solver, 1e-13);
  fcl::CollisionResult<S> res;
  fcl::collide(ga, ta, gb, tb, req, res);
  return res.isCollision();
}

Answer query(const Shape& a, const Shape& b) {
  auto ga = a.geometry(), gb = b.geometry();
  fcl::Transform3<S> ta = a.pose(Vec3::Zero()), tb = b.pose(Vec3::Zero());
  return {fclDistance(ga.get(), ta, gb.get(), tb, fcl::GST_INDEP), fclDistance(ga.get(), ta, gb.get(), tb, fcl::GST_LIBCCD),
          fclCollide(ga.get(), ta, gb.get(), tb, fcl::GST_INDEP), fclCollide(ga.get(), ta, gb.get(), tb, fcl::GST_LIBCCD)};
}

// Places b at a's centre + s·u (b keeps its shape and orientation) and returns the FCL distance.
double distanceAt(const Shape& a, Shape b, const Vec3& u, double s) {
  b.translate(a.centre() - b.centre() + s * u);
  Answer ans = query(a, b);
  // both solvers answer with the length of a point of the Minkowski difference (an upper bound of
  // the distance), so the smaller one is the better; a reported collision counts as 0
  double d = std::min(std::max(ans.distance, 0.0), std::max(ans.distanceCcd, 0.0));
  return d;
}

// Smallest s with FCL distance ≥ gap along u (bisection on the convex distance along the line).
double placeAtGap(const Shape& a, const Shape& b, const Vec3& u, double gap) {
  double lo = 0, hi = 0.1;
  while (distanceAt(a, b, u, hi) < gap) hi *= 2;
  for (int i = 0; i < 200 && hi - lo > 1e-15; i++) {
    double mid = 0.5 * (lo + hi);
    if (distanceAt(a, b, u, mid) < gap) lo = mid; else hi = mid;
  }
  return hi;
}

void printVec(const Vec3& v) { std::printf("[%.12g,%.12g,%.12g]", v[0], v[1], v[2]); }

void printShape(const Shape& s) {
  std::printf("{\"k\":\"%s\"", KIND_NAMES[s.kind]);
  if (s.kind == SPHERE) {
    std::printf(",\"c\":"); printVec(s.p); std::printf(",\"r\":%.12g", s.r);
  } else if (s.kind == CAPSULE) {
    std::printf(",\"from\":"); printVec(s.p); std::printf(",\"to\":"); printVec(s.to); std::printf(",\"r\":%.12g", s.r);
  } else {
    std::printf(",\"p\":"); printVec(s.p);
    std::printf(",\"q\":[%.12g,%.12g,%.12g,%.12g]", s.q[0], s.q[1], s.q[2], s.q[3]);
    if (s.kind == BOX) { std::printf(",\"s\":"); printVec(s.size); }
    else std::printf(",\"r\":%.12g,\"l\":%.12g", s.r, s.l);
  }
  std::printf("}");
}

}  // namespace

int main() {
  const int PER_REGIME = 55;
  const char* REGIMES[] = {"far", "near", "touching", "overlapping"};
  std::printf("{\"source\":\"FCL %s (libfcl-dev), GJKSolver_indep; tests/reference/fcl_fixtures.cpp\",\n\"pairs\":[\n", FCL_VERSION);
  bool first = true;
  for (int ka = 0; ka < 4; ka++) {
    for (int kb = ka; kb < 4; kb++) {
      for (int regime = 0; regime < 4; regime++) {
        for (int k = 0; k < PER_REGIME; k++) {
          Shape a = randomShape((Kind)ka), b = randomShape((Kind)kb);
          Vec3 u = randomUnit();
          // touching: within 1 nm of contact where FCL answers both questions in closed form
          // (pairs with a sphere), within 1 µm where its answers are iterative (GJK)
          double touch = ka == SPHERE ? 1e-9 : 1e-6;
          double s;
          if (regime == 0) s = placeAtGap(a, b, u, uniform(0.02, 0.6));
          else if (regime == 1) s = placeAtGap(a, b, u, std::exp(uniform(std::log(1e-4), std::log(1e-2))));
          else if (regime == 2) s = k % 2 == 0 ? placeAtGap(a, b, u, touch) : placeAtGap(a, b, u, 1e-12) - touch;
          else s = placeAtGap(a, b, u, 1e-12) * uniform(0.3, 0.995);
          b.translate(a.centre() - b.centre() + s * u);
          b.p = roundVec(b.p);
          if (b.kind == CAPSULE) b.to = roundVec(b.to);
          Answer ans = query(a, b);
          std::printf("%s{\"regime\":\"%s\",\"a\":", first ? "" : ",\n", REGIMES[regime]);
          printShape(a);
          std::printf(",\"b\":");
          printShape(b);
          std::printf(",\"distance\":%.17g,\"distanceCcd\":%.17g,\"collide\":%s,\"collideCcd\":%s}", ans.distance, ans.distanceCcd, ans.hit ? "true" : "false", ans.hitCcd ? "true" : "false");
          first = false;
        }
      }
    }
  }
  std::printf("\n]}\n");
  return 0;
}
