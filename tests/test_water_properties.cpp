// Water properties against published values (check-values.md; all values there are from
// memory of the named sources).
#include <doctest/doctest.h>

#include <cmath>

#include "deltag/water_properties.hpp"

using namespace deltag::thermo;

TEST_CASE("water density (Kell 1975) against IAPWS-95 at 25 degC") {
    // IAPWS-95: 997.05 kg/m^3 at 25 degC, 0.1 MPa (check-values.md, value from memory).
    CHECK(std::abs(water_density_kg_m3(25.0) - 997.05) < 0.02);
    // Kell (1975): the formula's constant term is the density at 0 degC, 999.83952 kg/m^3.
    CHECK(water_density_kg_m3(0.0) == doctest::Approx(999.83952).epsilon(1e-12));
    // Density maximum of liquid water near 4 degC (handbook fact, common knowledge).
    CHECK(water_density_kg_m3(4.0) > water_density_kg_m3(0.0));
    CHECK(water_density_kg_m3(4.0) > water_density_kg_m3(8.0));
    CHECK(water_density_kg_m3(100.0) < water_density_kg_m3(50.0));
}

TEST_CASE("relative permittivity (IAPWS 1997) at 0, 25 and 100 degC") {
    // Reference numbers from python3-iapws 1.5.3 (Debian), which evaluates the IAPWS (1997)
    // release (Fernandez et al. 1997, J. Phys. Chem. Ref. Data 26, 1125) with IAPWS-95
    // densities: IAPWS95(T, P = 0.101325 MPa).epsilon at 0 and 25 degC, and the saturated
    // liquid, IAPWS95(T, x = 0).epsilon, at 100 degC. deltag uses Kell's density instead of
    // IAPWS-95's (they differ by less than 0.02 kg/m^3 here), hence 0.005.
    CHECK(std::abs(water_relative_permittivity(0.0) - 87.9035) < 0.005);
    CHECK(std::abs(water_relative_permittivity(25.0) - 78.4085) < 0.005);
    CHECK(std::abs(water_relative_permittivity(100.0) - 55.5267) < 0.005);
    // Fernandez et al. (1997): 78.41 at 25 degC, 0.1 MPa (check-values.md gives 78.4; value from
    // memory).
    CHECK(std::abs(water_relative_permittivity(25.0) - 78.41) < 0.01);
    // On to 150 degC (saturated liquid, python3-iapws IAPWS95(T, x = 0).epsilon = 44.0305):
    // Kell's density at 1 atm is 0.18 kg/m^3 below the saturated liquid's there.
    CHECK(std::abs(water_relative_permittivity(150.0) - 44.0305) < 0.02);
}

TEST_CASE("Debye-Hueckel A and B from first principles at 25 and 100 degC") {
    const DebyeHuckelParameters dh = debye_huckel_parameters(25.0);
    // Helgeson & Kirkham (1974) Am. J. Sci. 274, 1199: A = 0.5091 kg^1/2 mol^-1/2 at 25 degC
    // (some tables give 0.5114; check-values.md, value from memory). Within 0.3 %.
    CHECK(std::abs(dh.a / 0.5091 - 1.0) < 0.003);
    // Helgeson & Kirkham (1974): B = 0.3283 kg^1/2 mol^-1/2 per angstrom (value from memory).
    CHECK(std::abs(dh.b / 0.3283 - 1.0) < 0.003);
    // Helgeson & Kirkham (1974): A = 0.5998, B = 0.3422 at 100 degC (saturation pressure;
    // values from memory). With the older Malmberg & Maryott (1956) permittivity A came out
    // 0.5959, 0.65 % low; with the IAPWS (1997) permittivity it is within 0.3 %.
    const DebyeHuckelParameters d100 = debye_huckel_parameters(100.0);
    CHECK(std::abs(d100.a / 0.5998 - 1.0) < 0.003);
    CHECK(std::abs(d100.b / 0.3422 - 1.0) < 0.003);
}

TEST_CASE("Debye-Hueckel A and B rise with temperature (0, 50, 100 degC)") {
    // Sanity: eps*T falls with temperature faster than rho does, so A ~ rho^1/2 (eps T)^-3/2
    // and B ~ rho^1/2 (eps T)^-1/2 rise (as in every published table of A and B).
    const DebyeHuckelParameters d0 = debye_huckel_parameters(0.0);
    const DebyeHuckelParameters d50 = debye_huckel_parameters(50.0);
    const DebyeHuckelParameters d100 = debye_huckel_parameters(100.0);
    CHECK(d0.a < d50.a);
    CHECK(d50.a < d100.a);
    CHECK(d0.b < d50.b);
    CHECK(d50.b < d100.b);
}

TEST_CASE("pKw on the saturation curve against Bandura & Lvov (2006)") {
    // Bandura & Lvov (2006) J. Phys. Chem. Ref. Data 35, 15, table values at saturation
    // pressure (check-values.md, values from memory). water_pkw interpolates these five
    // values (see water_properties.cpp for why), so at the nodes this checks the table was
    // entered correctly.
    CHECK(std::abs(water_pkw(0.0) - 14.946) < 0.02);
    CHECK(std::abs(water_pkw(25.0) - 13.995) < 0.005);
    CHECK(std::abs(water_pkw(50.0) - 13.264) < 0.02);
    CHECK(std::abs(water_pkw(75.0) - 12.696) < 0.02);
    CHECK(std::abs(water_pkw(100.0) - 12.252) < 0.02);
}

TEST_CASE("pKw between the table points against Harned & Owen") {
    // Harned & Owen, The Physical Chemistry of Electrolytic Solutions (3rd ed., 1958), pKw
    // from cell measurements, values from memory: 14.535 (10 degC), 14.167 (20), 13.833 (30),
    // 13.535 (40), 13.017 (60). They are independent of the interpolation nodes, so they test
    // the interpolation between them. Tolerance 0.01: the two data sets differ by a few
    // thousandths.
    CHECK(std::abs(water_pkw(10.0) - 14.535) < 0.01);
    CHECK(std::abs(water_pkw(20.0) - 14.167) < 0.01);
    CHECK(std::abs(water_pkw(30.0) - 13.833) < 0.01);
    CHECK(std::abs(water_pkw(40.0) - 13.535) < 0.01);
    CHECK(std::abs(water_pkw(60.0) - 13.017) < 0.01);
}
