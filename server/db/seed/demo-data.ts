// The demo network: invented organisations in real US cities (ZIP centroids only).
export interface DemoOrganization {
  key: string;
  kind: 'network' | 'lab' | 'partner';
  name: string;
  addressLine1: string;
  postalCode: string;
  timeZone: string;
  email: string;
  phone: string;
}

export const demoOrganizations: DemoOrganization[] = [
  { key: 'network', kind: 'network', name: 'Platterpost Network', addressLine1: '400 Market Street', postalCode: '19106', timeZone: 'America/New_York', email: 'ops@platterpost.example', phone: '+1 215 555 0100' },

  { key: 'quillmark', kind: 'lab', name: 'Quillmark Recovery Lab', addressLine1: '1120 East Washington Street', postalCode: '85004', timeZone: 'America/Phoenix', email: 'intake@quillmark.example', phone: '+1 602 555 0142' },
  { key: 'ferrowick', kind: 'lab', name: 'Ferrowick Data Lab', addressLine1: '901 West Jackson Boulevard', postalCode: '60607', timeZone: 'America/Chicago', email: 'intake@ferrowick.example', phone: '+1 312 555 0187' },
  { key: 'tidewater', kind: 'lab', name: 'Tidewater Platter Works', addressLine1: '225 Granby Street', postalCode: '23510', timeZone: 'America/New_York', email: 'intake@tidewaterplatter.example', phone: '+1 757 555 0119' },
  { key: 'saltgrass', kind: 'lab', name: 'Saltgrass Recovery', addressLine1: '340 South 400 West', postalCode: '84101', timeZone: 'America/Denver', email: 'intake@saltgrass.example', phone: '+1 801 555 0163' },
  { key: 'brindle-oak', kind: 'lab', name: 'Brindle & Oak Data Rescue', addressLine1: '1015 SW Morrison Street', postalCode: '97205', timeZone: 'America/Los_Angeles', email: 'intake@brindleoak.example', phone: '+1 503 555 0175' },
  { key: 'lumen-ridge', kind: 'lab', name: 'Lumen Ridge Recovery', addressLine1: '600 Congress Avenue', postalCode: '78701', timeZone: 'America/Chicago', email: 'intake@lumenridge.example', phone: '+1 512 555 0131' },
  { key: 'cobaltmere', kind: 'lab', name: 'Cobaltmere Flash Lab', addressLine1: '250 Marquette Avenue', postalCode: '55401', timeZone: 'America/Chicago', email: 'intake@cobaltmere.example', phone: '+1 612 555 0158' },

  { key: 'juniper-lane', kind: 'partner', name: 'Juniper Lane PC Clinic', addressLine1: '1550 Larimer Street', postalCode: '80202', timeZone: 'America/Denver', email: 'desk@juniperlane.example', phone: '+1 303 555 0122' },
  { key: 'bramblewood', kind: 'partner', name: 'Bramblewood Device Repair', addressLine1: '88 East Broadway Boulevard', postalCode: '85701', timeZone: 'America/Phoenix', email: 'desk@bramblewood.example', phone: '+1 520 555 0190' },
  { key: 'kettle-creek', kind: 'partner', name: 'Kettle Creek Computers', addressLine1: '45 North High Street', postalCode: '43215', timeZone: 'America/New_York', email: 'desk@kettlecreek.example', phone: '+1 614 555 0148' },
  { key: 'pinwheel', kind: 'partner', name: 'Pinwheel Phone & PC', addressLine1: '75 Peachtree Street', postalCode: '30303', timeZone: 'America/New_York', email: 'desk@pinwheelrepair.example', phone: '+1 404 555 0113' },
  { key: 'harbor-lantern', kind: 'partner', name: 'Harbor Lantern IT', addressLine1: '1420 Fifth Avenue', postalCode: '98101', timeZone: 'America/Los_Angeles', email: 'desk@harborlantern.example', phone: '+1 206 555 0167' },
  { key: 'redfern', kind: 'partner', name: 'Redfern Tech Bench', addressLine1: '1100 Walnut Street', postalCode: '64105', timeZone: 'America/Chicago', email: 'desk@redferntech.example', phone: '+1 816 555 0139' },
  { key: 'marigold', kind: 'partner', name: 'Marigold Micro Repair', addressLine1: '915 L Street', postalCode: '95814', timeZone: 'America/Los_Angeles', email: 'desk@marigoldmicro.example', phone: '+1 916 555 0104' },
  { key: 'sixpence', kind: 'partner', name: 'Sixpence Computer Care', addressLine1: '10 Tremont Street', postalCode: '02108', timeZone: 'America/New_York', email: 'desk@sixpencecare.example', phone: '+1 617 555 0181' },
  { key: 'cinder-hill', kind: 'partner', name: 'Cinder Hill Electronics', addressLine1: '211 Commerce Street', postalCode: '37203', timeZone: 'America/Chicago', email: 'desk@cinderhill.example', phone: '+1 615 555 0126' },
  { key: 'wrenfield', kind: 'partner', name: 'Wrenfield IT Services', addressLine1: '333 Fayetteville Street', postalCode: '27601', timeZone: 'America/New_York', email: 'desk@wrenfieldit.example', phone: '+1 919 555 0152' },
  { key: 'basalt-street', kind: 'partner', name: 'Basalt Street Repair', addressLine1: '320 Gold Avenue SW', postalCode: '87102', timeZone: 'America/Denver', email: 'desk@basaltstreet.example', phone: '+1 505 555 0170' },
  { key: 'otterbrook', kind: 'partner', name: 'Otterbrook PC Doctor', addressLine1: '700 North Water Street', postalCode: '53202', timeZone: 'America/Chicago', email: 'desk@otterbrook.example', phone: '+1 414 555 0195' },
];

/** Further staff so that staff lists and other labs have people in them. */
export const demoExtraStaff = [
  { organization: 'ferrowick', role: 'lab_manager', name: 'Olu Bankole', email: 'olu.bankole@ferrowick.example' },
  { organization: 'tidewater', role: 'lab_manager', name: 'Greta Lindqvist', email: 'greta.lindqvist@tidewaterplatter.example' },
  { organization: 'saltgrass', role: 'lab_manager', name: 'Marco Ibarra', email: 'marco.ibarra@saltgrass.example' },
  { organization: 'brindle-oak', role: 'lab_manager', name: 'Hana Whitfield', email: 'hana.whitfield@brindleoak.example' },
  { organization: 'lumen-ridge', role: 'lab_manager', name: 'Desmond Achebe', email: 'desmond.achebe@lumenridge.example' },
  { organization: 'cobaltmere', role: 'lab_manager', name: 'Priya Venkataraman', email: 'priya.venkataraman@cobaltmere.example' },
  { organization: 'bramblewood', role: 'partner_admin', name: 'Nadia Castellanos', email: 'nadia.castellanos@bramblewood.example' },
  { organization: 'kettle-creek', role: 'partner_admin', name: 'Ward Pemberton', email: 'ward.pemberton@kettlecreek.example' },
  { organization: 'juniper-lane', role: 'partner_staff', name: 'Ivy Okonkwo', email: 'ivy.okonkwo@juniperlane.example' },
] as const;
